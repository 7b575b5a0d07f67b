/**
 * Headers every answer carries. Pages also get a Content-Security-Policy from Astro (a meta tag
 * with the hashes of its own inline scripts and styles); the header here adds what a meta tag
 * cannot say (frame-ancestors) and locks down everything that is not a page.
 */
export function securityHeaders(response: Response, https: boolean): Response {
	const headers = new Headers(response.headers);
	const html = (headers.get('content-type') ?? '').includes('text/html');
	headers.set('x-content-type-options', 'nosniff');
	headers.set('referrer-policy', 'same-origin');
	if (!headers.has('x-frame-options')) headers.set('x-frame-options', 'DENY');
	headers.set('cross-origin-opener-policy', 'same-origin');
	headers.set('permissions-policy', 'camera=(), microphone=(), geolocation=(), payment=(), usb=()');
	const csp = headers.get('content-security-policy');
	// Astro writes the page policy (script and style hashes); a header may also forbid framing.
	if (csp && html && !/frame-ancestors/.test(csp))
		headers.set(
			'content-security-policy',
			`${csp.trim().replace(/;?$/, ';')} frame-ancestors 'none'`,
		);
	if (!csp) {
		headers.set(
			'content-security-policy',
			html
				? "frame-ancestors 'none'; base-uri 'self'; form-action 'self'; object-src 'none'"
				: "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'; sandbox",
		);
	}
	if (https) headers.set('strict-transport-security', 'max-age=31536000; includeSubDomains');
	return new Response(response.body, {
		status: response.status,
		statusText: response.statusText,
		headers,
	});
}
