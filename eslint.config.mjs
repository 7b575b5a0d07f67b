// @ts-check
import js from '@eslint/js';
import astro from 'eslint-plugin-astro';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

/** Outside the engine, its modules are reached through its index only. */
const ENGINE_DEEP = {
	group: [
		'@/engine/*',
		'!@/engine/browser',
		'!@/engine/calibration',
		'../engine/*',
		'../../engine/*',
		'../../../engine/*',
		'!**/engine/browser',
		'!**/engine/calibration',
	],
	message:
		"Import from '@/engine' (its index), '@/engine/browser' (in islands) or '@/engine/calibration' (the fit)",
};

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
		// zod through src/lib/zod.ts, which keeps it from probing `new Function` in the browser; the
		// engine through its index (`@/engine`), or its fitting entry (`@/engine/calibration`).
		files: ['src/**/*.{ts,tsx,astro}'],
		ignores: ['src/lib/zod.ts', 'src/engine/**'],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					paths: [{ name: 'zod', message: "Import z from '@/lib/zod'" }],
					patterns: [ENGINE_DEEP],
				},
			],
		},
	},
	{
		// Islands and the browser data layer see the contract (src/lib/schemas), never server code.
		files: ['src/components/**', 'src/lib/client/**'],
		ignores: ['src/lib/client/draft-check.ts'],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					paths: [
						{ name: 'zod', message: "Import z from '@/lib/zod'" },
						{
							name: '@/engine',
							message:
								"Islands take the engine from '@/engine/browser' (no schema library); the draft check loads the schema on first touch",
						},
					],
					patterns: [
						ENGINE_DEEP,
						{
							group: ['@/lib/server/*', '**/lib/server/*'],
							message: 'Islands import DTOs from @/lib/schemas',
						},
					],
				},
			],
		},
	},
	{
		// The engine (and its input contract) stands alone: nothing of the app runs into it.
		files: ['src/engine/**'],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					paths: [{ name: 'zod', message: "The engine's contract uses 'zod/mini'" }],
					patterns: [
						{
							group: ['@/*', '../*', '!../engine/*'],
							message: 'The engine imports only its own modules and packages',
						},
					],
				},
			],
		},
	},
);
