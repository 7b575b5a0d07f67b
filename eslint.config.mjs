// @ts-check
import js from '@eslint/js';
import astro from 'eslint-plugin-astro';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default tseslint.config(
	{ ignores: ['dist/', '.data/', '.astro/', 'node_modules/', 'public/'] },
	js.configs.recommended,
	...tseslint.configs.recommended,
	...astro.configs.recommended,
	{
		languageOptions: { globals: { ...globals.node, ...globals.browser } },
		rules: {
			'@typescript-eslint/no-unused-vars': [
				'error',
				{
					argsIgnorePattern: '^_',
					varsIgnorePattern: '^_',
					caughtErrors: 'none',
					ignoreRestSiblings: true,
				},
			],
			'@typescript-eslint/consistent-type-imports': [
				'error',
				{ fixStyle: 'inline-type-imports', disallowTypeAnnotations: false },
			],
		},
	},
	{
		files: ['**/*.tsx'],
		plugins: { 'react-hooks': reactHooks },
		rules: { 'react-hooks/rules-of-hooks': 'error', 'react-hooks/exhaustive-deps': 'error' },
	},
	{
		// Migrations are frozen in time and written against Kysely<any>; tests build hostile inputs.
		files: ['db/migrations/**', 'db/migrator.ts', 'tests/**'],
		rules: { '@typescript-eslint/no-explicit-any': 'off' },
	},
	{
		// Only the data layer writes SQL; routes, pages and other server code call it.
		files: [
			'src/pages/**',
			'src/components/**',
			'src/lib/client/**',
			'src/lib/schemas/**',
			'src/engine/**',
		],
		rules: {
			'no-restricted-syntax': [
				'error',
				{
					selector:
						'CallExpression[callee.property.name=/^(selectFrom|insertInto|updateTable|deleteFrom)$/]',
					message: 'Queries live in src/lib/server/db/<aggregate>.ts',
				},
			],
		},
	},
	{
		// zod through src/lib/zod.ts, which keeps it from probing `new Function` in the browser.
		files: ['src/**/*.{ts,tsx}'],
		ignores: ['src/lib/zod.ts'],
		rules: {
			'no-restricted-imports': [
				'error',
				{ paths: [{ name: 'zod', message: "Import z from '@/lib/zod'" }] },
			],
		},
	},
	{
		// Islands and the browser data layer see the contract (src/lib/schemas), never server code.
		files: ['src/components/**', 'src/lib/client/**'],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					paths: [{ name: 'zod', message: "Import z from '@/lib/zod'" }],
					patterns: [
						{
							group: ['@/lib/server/*', '**/lib/server/*'],
							message: 'Islands import DTOs from @/lib/schemas',
						},
					],
				},
			],
		},
	},
);
