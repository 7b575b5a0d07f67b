/// <reference types="vitest/config" />
// @ts-check
// https://docs.astro.build/en/guides/testing/#vitest
import { getViteConfig } from 'astro/config';

const pgSetup = 'tests/helpers/pg-global-setup.ts';

export default getViteConfig({
	esbuild: { jsx: 'automatic' },
	test: {
		environment: 'node',
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					setupFiles: ['tests/helpers/fast-check-setup.ts'],
					include: [
						'tests/engine/**/*.test.ts',
						'tests/lib/**/*.test.{ts,tsx}',
						'tests/components/**/*.test.tsx',
					],
				},
			},
			{
				extends: true,
				test: {
					name: 'integration',
					include: [
						'tests/db/**/*.test.ts',
						'tests/api/**/*.test.ts',
						'tests/spice/**/*.test.ts',
						'tests/security/*.test.ts',
					],
					globalSetup: [pgSetup],
					testTimeout: 30_000,
					hookTimeout: 60_000,
				},
			},
			{
				extends: true,
				test: {
					name: 'browser',
					include: ['tests/e2e/**/*.test.ts', 'tests/security/server/**/*.test.ts'],
					globalSetup: [pgSetup, 'tests/helpers/app-global-setup.ts'],
					testTimeout: 60_000,
					hookTimeout: 180_000,
				},
			},
		],
	},
});
