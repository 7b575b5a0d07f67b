import type { Kysely } from 'kysely';
import { serverVersion } from '@/lib/server/db/client';
import type { Database } from '@/lib/server/db/schema';
import type { Storage } from './storage';

export interface ServiceHealth {
	status: 'ok' | 'down';
	latencyMs: number;
	detail?: string;
}

export interface HealthReport {
	status: 'ok' | 'degraded';
	version: string;
	database: ServiceHealth & { serverVersion?: string };
	storage: ServiceHealth;
}

const HEALTH_TIMEOUT_MS = 3000;

function withDeadline<T>(work: Promise<T>, ms: number, what: string): Promise<T> {
	let timer: NodeJS.Timeout;
	return Promise.race([
		work,
		new Promise<T>(
			(_, reject) =>
				(timer = setTimeout(() => reject(new Error(`${what} did not answer within ${ms} ms`)), ms)),
		),
	]).finally(() => clearTimeout(timer));
}

const ms = (since: number) => Math.round((performance.now() - since) * 10) / 10;

/** One real round trip: asks the server for its version and times it. */
export async function checkDatabase(db: Kysely<Database>): Promise<HealthReport['database']> {
	const started = performance.now();
	try {
		const version = await withDeadline(serverVersion(db), HEALTH_TIMEOUT_MS, 'the database');
		return { status: 'ok', latencyMs: ms(started), serverVersion: version };
	} catch (error) {
		return { status: 'down', latencyMs: ms(started), detail: (error as Error).message };
	}
}

/** One round trip to the file store (the bucket exists and answers). */
export async function checkStorage(storage: Storage): Promise<ServiceHealth> {
	const started = performance.now();
	try {
		await withDeadline(storage.ping(), HEALTH_TIMEOUT_MS, 'the file store');
		return { status: 'ok', latencyMs: ms(started) };
	} catch (error) {
		return { status: 'down', latencyMs: ms(started), detail: (error as Error).message };
	}
}
