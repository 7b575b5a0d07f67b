/// <reference types="astro/client" />

declare namespace App {
	interface Locals {
		db: import('kysely').Kysely<import('../db/schema').Database>;
	}
}
