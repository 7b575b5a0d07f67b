export interface FieldError {
	path: string;
	message: string;
}

/** A non-OK answer from our API, carrying the problem-details code and field errors. */
export class ApiError extends Error {
	constructor(
		readonly status: number,
		readonly code: string,
		message: string,
		readonly fieldErrors: FieldError[] = [],
	) {
		super(message);
	}

	/** Field errors keyed by path, for showing next to each field. */
	byField(): Record<string, string> {
		return Object.fromEntries(this.fieldErrors.map((e) => [e.path, e.message]));
	}
}

async function parse<T>(res: Response): Promise<T> {
	if (res.ok) return (res.status === 204 ? undefined : await res.json()) as T;
	let body: { code?: string; detail?: string; errors?: FieldError[] } = {};
	try {
		body = await res.json();
	} catch {
		// not JSON (a proxy error page, say)
	}
	throw new ApiError(res.status, body.code ?? 'internal', body.detail ?? `The server answered ${res.status}`, body.errors ?? []);
}

export async function getJson<T>(url: string, init: { signal?: AbortSignal } = {}): Promise<T> {
	return parse<T>(await fetch(url, { headers: { accept: 'application/json' }, signal: init.signal }));
}

export async function sendJson<T>(url: string, method: 'POST' | 'PATCH' | 'PUT' | 'DELETE', body?: unknown): Promise<T> {
	return parse<T>(
		await fetch(url, {
			method,
			headers: { 'content-type': 'application/json', accept: 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body),
		}),
	);
}

export const postJson = <T,>(url: string, body?: unknown) => sendJson<T>(url, 'POST', body ?? {});
