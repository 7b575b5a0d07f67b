import 'astro';

declare module 'astro' {
	interface AstroClientDirectives {
		/** Hydrate on first interaction (src/lib/client/directives/interact.ts). */
		'client:interact'?: boolean;
	}
}
