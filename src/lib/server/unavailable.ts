/**
 * Tells a failure of an outside service (the database, the file store) from a bug, so that a
 * request answers 503 "try again" while a service is down instead of a 500.
 */

/** Thrown by the storage layer when the file store fails, times out or cannot be reached. */
export class StorageUnavailableError extends Error {
	override readonly name = 'StorageUnavailableError';
	constructor(operation: string, cause: unknown) {
		super(
			`file storage ${operation} failed: ${cause instanceof Error ? cause.message : String(cause)}`,
			{ cause },
		);
	}
}

const NETWORK_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'EPIPE',
	'ETIMEDOUT',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'ENOTFOUND',
	'EAI_AGAIN',
	'ECONNABORTED',
]);
// SQLSTATE classes and codes that mean "the server is not there or is going away", not "your query is wrong".
const PG_UNAVAILABLE = new Set([
	'57P01',
	'57P02',
	'57P03',
	'53300',
	'08000',
	'08001',
	'08003',
	'08004',
	'08006',
	'08007',
	'08P01',
]);
const PG_MESSAGES = [
	/Connection terminated/i,
	/timeout exceeded when trying to connect/i,
	/Client has encountered a connection error/i,
	/Query read timeout/i,
	/the database system is (starting up|shutting down|in recovery mode)/i,
	/terminating connection due to administrator command/i,
	/Client was closed and is not queryable/i,
	/Cannot use a pool after calling end/i,
];

function* causes(error: unknown): Generator<unknown> {
	let current: unknown = error;
	for (let depth = 0; current && depth < 6; depth++) {
		yield current;
		current = (current as { cause?: unknown }).cause;
	}
}

/** True when the error says the database cannot be reached right now. */
export function isDatabaseUnavailable(error: unknown): boolean {
	for (const e of causes(error)) {
		if (e instanceof StorageUnavailableError) return false;
		const { code, message } = e as { code?: unknown; message?: unknown };
		if (typeof code === 'string' && (PG_UNAVAILABLE.has(code) || NETWORK_CODES.has(code)))
			return true;
		if (typeof message === 'string' && PG_MESSAGES.some((re) => re.test(message))) return true;
		if (e instanceof AggregateError && e.errors.some((x) => isDatabaseUnavailable(x))) return true;
	}
	return false;
}

export function isStorageUnavailable(error: unknown): boolean {
	for (const e of causes(error)) if (e instanceof StorageUnavailableError) return true;
	return false;
}
