/// <reference types="astro/client" />
/// <reference types="vite-plugin-pwa/client" />
/// <reference types="vite-plugin-pwa/info" />

declare namespace App {
	interface Locals {
		db: import('kysely').Kysely<import('./lib/server/db/schema').Database>;
		user: import('./lib/server/auth').AppUser | null;
		mailer: import('./lib/server/mail').Mailer;
		config: import('./lib/server/config').ServerConfig;
		storage: import('./lib/server/storage').Storage;
	}
}
