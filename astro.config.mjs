// @ts-check
// https://astro.build/config
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import auth from 'auth-astro';
import { defineConfig, envField } from 'astro/config';

const allowedHosts = (process.env.ALLOWED_HOSTS ?? '127.0.0.1,localhost')
	.split(',')
	.map((hostname) => ({ hostname: hostname.trim() }))
	.filter((entry) => entry.hostname);

export default defineConfig({
	output: 'server',
	adapter: node({ mode: 'standalone' }),
	integrations: [react(), auth()],
	server: { host: '127.0.0.1', port: 4321 },
	// Astro 5 ignores the Host header unless it is listed; without this, request.url loses its port.
	security: { checkOrigin: true, allowedDomains: allowedHosts },
	// Every page carries a Content-Security-Policy with the hashes of Astro's own inline scripts
	// and styles; the server adds frame-ancestors and the other headers (src/lib/server/security-headers.ts).
	experimental: {
		csp: {
			directives: [
				"default-src 'self'",
				"img-src 'self' data: blob:",
				"font-src 'self'",
				"connect-src 'self'",
				"worker-src 'self' blob:",
				"manifest-src 'self'",
				"object-src 'none'",
				"base-uri 'self'",
				"form-action 'self'",
			],
		},
	},
	// Fonts and images ship as files, never inlined as data: URIs (the policy allows only our own files).
	vite: { plugins: [tailwindcss()], build: { assetsInlineLimit: 0 } },
	env: {
		schema: {
			DATABASE_URL: envField.string({ context: 'server', access: 'secret' }),
		},
	},
});
