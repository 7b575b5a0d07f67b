/** fetch with a cookie jar and the Origin header Astro's same-origin check wants, for HTTP-level tests. */
export class HttpSession {
	private cookies = new Map<string, string>();
	constructor(readonly base: string) {}

	async fetch(path: string, init: RequestInit = {}): Promise<Response> {
		const headers = new Headers(init.headers);
		headers.set('origin', this.base);
		if (this.cookies.size)
			headers.set('cookie', [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '));
		const res = await fetch(path.startsWith('http') ? path : `${this.base}${path}`, {
			...init,
			headers,
			redirect: 'manual',
		});
		for (const c of res.headers.getSetCookie()) {
			const [pair] = c.split(';');
			const eq = pair!.indexOf('=');
			const name = pair!.slice(0, eq);
			const value = pair!.slice(eq + 1);
			if (value === '' || /max-age=0/i.test(c) || /expires=thu, 01 jan 1970/i.test(c))
				this.cookies.delete(name);
			else this.cookies.set(name, value);
		}
		return res;
	}

	async csrf(): Promise<string> {
		return ((await (await this.fetch('/api/auth/csrf')).json()) as { csrfToken: string }).csrfToken;
	}

	async signInWithPassword(email: string, password: string): Promise<Response> {
		const body = new URLSearchParams({
			email,
			password,
			csrfToken: await this.csrf(),
			callbackUrl: `${this.base}/teams`,
		});
		return this.fetch('/api/auth/callback/credentials', {
			method: 'POST',
			body,
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
		});
	}

	async session(): Promise<{ user?: { id: string; email: string } } | null> {
		return (await (await this.fetch('/api/auth/session')).json()) as {
			user?: { id: string; email: string };
		} | null;
	}
}
