// Astro's own formatting settings, so code copied from its docs already matches.
/** @type {import('prettier').Config} */
export default {
	plugins: ['prettier-plugin-astro'],
	useTabs: true,
	singleQuote: true,
	printWidth: 100,
	trailingComma: 'all',
	overrides: [{ files: '*.astro', options: { parser: 'astro' } }],
};
