/**
 * JSON packed as base64 for an island's props. A large document (a plan of a thousand cables)
 * handed over as JSON text is full of quotes, and the server escapes each one for the HTML
 * attribute the props live in, one callback per quote; base64 has nothing to escape, so the
 * server's render copies it once. Works on the server (Buffer) and in the browser (atob).
 */

/**
 * On the server, the value each recent packing was made from: the island's render in the same
 * request reads it back without decoding. Bounded; entries are the page's own objects.
 */
const packedOnServer = new Map<string, unknown>();

export function packJson(value: unknown): string {
	const packed = Buffer.from(JSON.stringify(value), 'utf8').toString('base64');
	packedOnServer.set(packed, value);
	if (packedOnServer.size > 16) packedOnServer.delete(packedOnServer.keys().next().value!);
	return packed;
}

/** JSON text as it is (from the database), packed the same way without parsing it first. */
export function packJsonText(text: string): string {
	return Buffer.from(text, 'utf8').toString('base64');
}

export function unpackJson<T>(packed: string): T {
	if (typeof window === 'undefined') {
		const known = packedOnServer.get(packed);
		// The render only reads it (React state is never changed in place).
		if (known !== undefined) return known as T;
		return JSON.parse(Buffer.from(packed, 'base64').toString('utf8')) as T;
	}
	const bytes = Uint8Array.from(atob(packed), (c) => c.charCodeAt(0));
	return JSON.parse(new TextDecoder().decode(bytes)) as T;
}
