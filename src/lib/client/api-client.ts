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
		/** The whole problem body, with any extension members (the current state a 409 carries). */
		readonly body: Record<string, unknown> = {},
	) {
		super(message);
	}

	/** Field errors keyed by path, for showing next to each field. */
	byField(): Record<string, string> {
		return Object.fromEntries(this.fieldErrors.map((e) => [e.path, e.message]));
	}
}

function problemOf(status: number, text: string): ApiError {
	let body: { code?: string; detail?: string; errors?: FieldError[] } & Record<string, unknown> =
		{};
	try {
		const parsed: unknown = JSON.parse(text);
		if (parsed && typeof parsed === 'object' && !Array.isArray(parsed))
			body = parsed as typeof body;
	} catch {
		// not JSON (a proxy error page, say)
	}
	return new ApiError(
		status,
		body.code ?? 'internal',
		body.detail ?? `The server answered ${status}`,
		body.errors ?? [],
		body,
	);
}

export interface ApiRequest {
	method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
	/** Sent as JSON. */
	json?: unknown;
	/** Sent as multipart form data (files). */
	form?: FormData;
	signal?: AbortSignal;
	/** Upload progress, 0–100 (forms only). */
	onUploadProgress?: (percent: number) => void;
}

/**
 * The one way the browser calls the API: JSON or a form in, JSON out, and any answer that is not
 * OK thrown as an ApiError with the problem's code, words and field errors. A network failure is
 * an ApiError too (status 0), so callers show one kind of message.
 */
export async function api<T = void>(url: string, req: ApiRequest = {}): Promise<T> {
	const method = req.method ?? (req.json !== undefined || req.form ? 'POST' : 'GET');
	if (req.form && req.onUploadProgress)
		return upload<T>(url, method, req.form, req.onUploadProgress, req.signal);
	let res: Response;
	try {
		res = await fetch(url, {
			method,
			headers: {
				accept: 'application/json',
				...(req.json !== undefined && { 'content-type': 'application/json' }),
			},
			body: req.form ?? (req.json === undefined ? undefined : JSON.stringify(req.json)),
			signal: req.signal,
		});
	} catch (error) {
		if ((error as Error).name === 'AbortError') throw error;
		throw new ApiError(
			0,
			'network',
			'Could not reach the server. Check the connection and try again.',
		);
	}
	if (!res.ok) throw problemOf(res.status, await res.text().catch(() => ''));
	if (res.status === 204) return undefined as T;
	const text = await res.text();
	return (text ? JSON.parse(text) : undefined) as T;
}

/** A form upload through XMLHttpRequest, the one browser API that reports upload progress. */
function upload<T>(
	url: string,
	method: string,
	form: FormData,
	onProgress: (percent: number) => void,
	signal?: AbortSignal,
): Promise<T> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open(method, url);
		xhr.setRequestHeader('accept', 'application/json');
		xhr.upload.onprogress = (e) =>
			e.lengthComputable && onProgress(Math.round((100 * e.loaded) / e.total));
		xhr.upload.onload = () => onProgress(100);
		xhr.onload = () => {
			if (xhr.status >= 300) return reject(problemOf(xhr.status, xhr.responseText));
			try {
				resolve((xhr.responseText ? JSON.parse(xhr.responseText) : undefined) as T);
			} catch {
				reject(
					new ApiError(xhr.status, 'internal', 'The server sent an answer that could not be read.'),
				);
			}
		};
		xhr.onerror = () =>
			reject(
				new ApiError(
					0,
					'network',
					'The upload was interrupted. Check the connection and try again.',
				),
			);
		signal?.addEventListener('abort', () => xhr.abort());
		xhr.send(form);
	});
}

export const getJson = <T>(url: string, init: { signal?: AbortSignal } = {}) =>
	api<T>(url, { signal: init.signal });
