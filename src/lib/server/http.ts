import type { z } from '@/lib/zod';
import { findControlCharacter, NOTES_MESSAGE } from '@/lib/schemas/text';
import { BodyTooLargeError, MAX_JSON_BYTES, readBytes } from './body';
import { currentRequestId } from './request-context';

export type ErrorCode =
	| 'invalid_input'
	| 'unsupported_media_type'
	| 'unauthenticated'
	| 'forbidden'
	| 'not_found'
	| 'conflict'
	| 'possible_duplicate'
	| 'rate_limited'
	| 'database_unavailable'
	| 'email_taken'
	| 'invalid_token'
	| 'token_expired'
	| 'token_used'
	| 'email_mismatch'
	| 'last_captain'
	| 'confirmation_mismatch'
	| 'invalid_backup'
	| 'invalid_merge'
	| 'confirm_findings'
	| 'unsupported_version'
	| 'too_large'
	| 'storage_unavailable'
	| 'engine_busy'
	| 'internal';

export interface FieldError {
	path: string;
	message: string;
}

const titles: Record<number, string> = {
	400: 'Bad Request',
	401: 'Unauthorized',
	403: 'Forbidden',
	404: 'Not Found',
	409: 'Conflict',
	410: 'Gone',
	413: 'Content Too Large',
	415: 'Unsupported Media Type',
	422: 'Unprocessable Content',
	429: 'Too Many Requests',
	500: 'Internal Server Error',
	503: 'Service Unavailable',
};

export interface ProblemBody {
	type: string;
	title: string;
	status: number;
	code: ErrorCode;
	detail: string;
	errors?: FieldError[];
	requestId?: string;
}

/** An RFC 9457 problem-details response with a stable lower-snake `code` extension. */
export function problem(
	status: number,
	code: ErrorCode,
	detail: string,
	errors?: FieldError[],
	headers: Record<string, string> = {},
	/** Extension members (RFC 9457 §3.2), e.g. the current state a 409 carries. */
	members: Record<string, unknown> = {},
): Response {
	const body: ProblemBody = {
		...members,
		type: 'about:blank',
		title: titles[status] ?? 'Error',
		status,
		code,
		detail,
		errors,
		// The request's id, as in the server's logs: what a member quotes when reporting a problem.
		requestId: currentRequestId(),
	};
	return new Response(JSON.stringify(body), {
		status,
		headers: { 'content-type': 'application/problem+json', ...headers },
	});
}

/** Turns zod issues into `{ path, message }` pairs, with dotted paths (`cables.2.lengthM`). */
export function toFieldErrors(error: z.ZodError): FieldError[] {
	return error.issues.map((issue) => ({
		path: issue.path.map(String).join('.'),
		message: issue.message,
	}));
}

export type ReadResult<T> = { ok: true; data: T } | { ok: false; response: Response };

/** Reads a JSON body and validates it: 415 when not JSON, 400 with field errors when invalid. */
export async function readJson<S extends z.ZodType>(
	request: Request,
	schema: S,
	limit = MAX_JSON_BYTES,
): Promise<ReadResult<z.infer<S>>> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.toLowerCase().startsWith('application/json')) {
		return {
			ok: false,
			response: problem(415, 'unsupported_media_type', 'Send the body as application/json'),
		};
	}
	let raw: unknown;
	try {
		raw = JSON.parse(
			new TextDecoder('utf-8', { fatal: true }).decode(await readBytes(request, limit)),
		);
	} catch (error) {
		if (error instanceof BodyTooLargeError)
			return {
				ok: false,
				response: problem(
					413,
					'too_large',
					`The body is larger than ${Math.round(limit / 1024)} KB`,
				),
			};
		return { ok: false, response: problem(400, 'invalid_input', 'The body is not valid JSON') };
	}
	return validated(schema, raw, 'Some fields need attention');
}

/**
 * Validates with the schema, then refuses a control character left in any string of the result
 * (a field the schema takes as free text, an id, a key), naming the field: 400, never a 500 from
 * the database.
 */
export function validated<S extends z.ZodType>(
	schema: S,
	raw: unknown,
	detail: string,
): ReadResult<z.infer<S>> {
	const parsed = schema.safeParse(raw);
	if (!parsed.success)
		return {
			ok: false,
			response: problem(400, 'invalid_input', detail, toFieldErrors(parsed.error)),
		};
	const bad = findControlCharacter(parsed.data);
	if (bad !== null)
		return {
			ok: false,
			response: problem(400, 'invalid_input', detail, [{ path: bad, message: NOTES_MESSAGE }]),
		};
	return { ok: true, data: parsed.data };
}

/** Validates a URL's query parameters: 400 with field errors when invalid. */
export function readQuery<S extends z.ZodType>(url: URL, schema: S): ReadResult<z.infer<S>> {
	return validated(
		schema,
		Object.fromEntries(url.searchParams),
		'Some query parameters need attention',
	);
}

/** A 409 problem that carries what the client needs to merge (the current state, its own input). */
export function conflict(detail: string, extra: Record<string, unknown>): Response {
	return problem(409, 'conflict', detail, undefined, {}, extra);
}

/** 503 while an outside service (the database, the file store) is down: nothing was changed, try again. */
export function unavailable(service: 'database' | 'storage'): Response {
	return service === 'database'
		? problem(
				503,
				'database_unavailable',
				'The database is not answering right now. Nothing was changed; try again in a moment.',
				undefined,
				{ 'retry-after': '5', 'cache-control': 'no-store' },
			)
		: problem(
				503,
				'storage_unavailable',
				'The file store is not answering right now. Nothing was changed; try again in a moment.',
				undefined,
				{ 'retry-after': '5', 'cache-control': 'no-store' },
			);
}
