// @ts-check
// https://astro.build/config
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import AstroPWA from '@vite-pwa/astro';
import auth from 'auth-astro';
import { fileURLToPath } from 'node:url';
import { precompress } from './src/cli/precompress.ts';
import { build } from 'esbuild';
import path from 'node:path';
import { defineConfig, envField } from 'astro/config';

const allowedHosts = (process.env.ALLOWED_HOSTS ?? '127.0.0.1,localhost')
	.split(',')
	.map((hostname) => ({ hostname: hostname.trim() }))
	.filter((entry) => entry.hostname);

/**
 * A workbox plugin (serialised into the service worker): an answer is kept only when it was made
 * for the member signed in on the device now (its `x-sagwise-user`; one that arrives after a
 * sign-out is dropped), and a kept answer is served only to that member. `self.sagwiseCurrentUser`
 * comes from public/sw-user.js.
 */
/** @type {import('workbox-core/types').WorkboxPlugin} */
const ownAnswersOnly = {
	cacheWillUpdate: async ({ response }) => {
		const who = response.headers.get('x-sagwise-user');
		const me = await /** @type {any} */ (self).sagwiseCurrentUser();
		return who && me && who === me ? response : null;
	},
	cachedResponseWillBeUsed: async ({ cachedResponse }) => {
		if (!cachedResponse) return null;
		const me = await /** @type {any} */ (self).sagwiseCurrentUser();
		return me && cachedResponse.headers.get('x-sagwise-user') === me ? cachedResponse : null;
	},
};

export default defineConfig({
	output: 'server',
	adapter: node({ mode: 'standalone' }),
	integrations: [
		react(),
		{
			name: 'sagwise-precompress',
			hooks: {
				// Static files go out precompressed (brotli and gzip written once, here; src/cli/serve.ts
				// picks the one the browser accepts).
				'astro:build:done': async ({ dir, logger }) => {
					// With server output `dir` is the client folder (dist/client); be sure of it.
					const out = fileURLToPath(dir);
					const clientDir = /[\\/]client[\\/]?$/.test(out) ? out : `${out}/client`;
					logger.info(`precompressed ${precompress(clientDir)} static files`);
					// The HTTP front as plain JavaScript beside the build: served by `node dist/serve.mjs`,
					// with no TypeScript loader in the server (its module hooks would see every import).
					await build({
						entryPoints: ['src/cli/serve.ts'],
						outfile: path.join(path.dirname(clientDir), 'serve.mjs'),
						bundle: true,
						platform: 'node',
						format: 'esm',
						target: 'node20',
						packages: 'external',
						logLevel: 'warning',
					});
					logger.info('bundled the HTTP front (serve.mjs)');
				},
			},
		},
		{
			name: 'sagwise-client-directives',
			hooks: {
				'astro:config:setup': ({ addClientDirective }) => {
					addClientDirective({
						name: 'interact',
						entrypoint: './src/lib/client/directives/interact.ts',
					});
				},
			},
		},
		auth(),
		// The app installs to a phone's home screen and keeps working at the lanes with no signal:
		// the service worker holds the app's files, and the pages and data a member opened before
		// (network first, the copy when the network fails). Writes made offline wait in the page's
		// outbox (src/lib/client/outbox.ts), never in the worker.
		AstroPWA({
			registerType: 'autoUpdate',
			injectRegister: false,
			includeAssets: ['favicon.svg', 'icons/apple-touch-icon.png'],
			manifest: {
				id: '/teams',
				name: 'Sagwise',
				short_name: 'Sagwise',
				description: 'Power budgets, builds, runs and checks for car-audio competition teams',
				start_url: '/teams',
				scope: '/',
				display: 'standalone',
				background_color: '#f7f5f0',
				theme_color: '#16202a',
				icons: [
					{ src: '/icons/icon-192.png', sizes: '192x192', type: 'image/png' },
					{ src: '/icons/icon-512.png', sizes: '512x512', type: 'image/png' },
					{
						src: '/icons/maskable-512.png',
						sizes: '512x512',
						type: 'image/png',
						purpose: 'maskable',
					},
				],
			},
			workbox: {
				navigateFallback: null,
				globPatterns: ['**/*.{js,css,woff2,svg,png,webmanifest}'],
				globIgnores: ['sw-user.js'],
				cleanupOutdatedCaches: true,
				// Kept pages and data belong to one member (public/sw-user.js and the plugin below).
				importScripts: ['/sw-user.js'],
				runtimeCaching: [
					{
						urlPattern: ({ request, url }) =>
							request.mode === 'navigate' && url.pathname.startsWith('/teams'),
						handler: 'NetworkFirst',
						options: {
							cacheName: 'sagwise-pages',
							networkTimeoutSeconds: 6,
							expiration: { maxEntries: 60, maxAgeSeconds: 14 * 24 * 3600 },
							cacheableResponse: { statuses: [200] },
							plugins: [ownAnswersOnly],
						},
					},
					{
						urlPattern: ({ request, url }) =>
							request.method === 'GET' &&
							/^\/api\/teams\/[^/]+\/(runs|events|vehicles)(\/|$)/.test(url.pathname) &&
							!/\/(export|files|photos)(\/|\.|$)|\.csv$/.test(url.pathname),
						handler: 'NetworkFirst',
						options: {
							cacheName: 'sagwise-data',
							networkTimeoutSeconds: 6,
							expiration: { maxEntries: 200, maxAgeSeconds: 14 * 24 * 3600 },
							cacheableResponse: { statuses: [200] },
							plugins: [ownAnswersOnly],
						},
					},
				],
			},
		}),
	],
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
	vite: {
		plugins: [tailwindcss()],
		build: {
			assetsInlineLimit: 0,
			rollupOptions: {
				// The engine is pure (no I/O, nothing done on import): a page takes only the models it
				// calls, though islands import the engine through one entry. Its document schema
				// configures zod's messages on import, so that module keeps its side effects.
				treeshake: {
					moduleSideEffects: (id) =>
						!/[\\/]src[\\/]engine[\\/]/.test(id) || /document-schema/.test(id),
				},
				// zod's sources carry comments about its own tree-shaking in places Rollup cannot read
				// as annotations; Rollup drops them (harmless) and says so four times per build.
				onwarn(warning, warn) {
					if (
						warning.code === 'INVALID_ANNOTATION' &&
						/node_modules[\\/]zod[\\/]/.test(warning.id ?? '')
					)
						return;
					warn(warning);
				},
			},
		},
	},
	env: {
		schema: {
			DATABASE_URL: envField.string({ context: 'server', access: 'secret' }),
		},
	},
});
