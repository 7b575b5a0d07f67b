// Astro's own formatting settings, so code copied from its docs already matches.
/** @type {import('prettier').Config} */
export default {
	useTabs: true,
	singleQuote: true,
	printWidth: 100,
	trailingComma: 'all',
};
