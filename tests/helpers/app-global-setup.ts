import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { sql } from 'kysely';
import type { TestProject } from 'vitest/node';
import { ensureCluster } from '../../db/cluster';
import { seedDemo } from '../../db/seed';
import { buildIsStale } from '../../src/cli/build-state';
import { startSmtpFake } from '../../src/cli/smtp-fake';
import { startS3Fake } from '../../src/cli/s3-fake';
import { createDb } from '../../src/lib/server/db/client';
import { startAppServer } from './app-server';
import { CHROMIUM_PATH } from './browser';
import { TEST_CLUSTER } from './pg-global-setup';

declare module 'vitest' {
	export interface ProvidedContext {
		appUrl: string;
		outboxDir: string;
	}
}

const PORT = Number(process.env.SAGWISE_TEST_APP_PORT ?? 4399);

/** Builds the app when needed and serves it on a test port against a seeded throwaway database. */
export default async function setup(project: TestProject) {
	if (!existsSync(CHROMIUM_PATH)) {
		throw new Error(
			`Browser tests need Debian's chromium at ${CHROMIUM_PATH}: install it with \`apt-get install chromium\`.`,
		);
	}
	if (buildIsStale()) {
		// The production build, as `npm start` serves it (vitest's NODE_ENV=test would compile JSX
		// for React's development runtime and leave a dist/ that `npm start` cannot serve).
		const build = spawnSync('npx', ['astro', 'build'], {
			stdio: 'inherit',
			env: { ...process.env, NODE_ENV: 'production' },
		});
		if (build.status !== 0) throw new Error('astro build failed; browser tests need the built app');
	}
	const cluster = await ensureCluster(TEST_CLUSTER);
	const name = `e2e_${Date.now()}`;
	const admin = createDb(cluster.url(), 1);
	await sql`create database ${sql.id(name)} template ${sql.id(`sagwise_template_${process.env.SAGWISE_TEST_RUN}`)}`.execute(
		admin,
	);
	const db = createDb(cluster.url(name), 1);
	await seedDemo(db);
	await db.destroy();

	const appUrl = `http://127.0.0.1:${PORT}`;
	const smtp = await startSmtpFake({ port: 0, dir: `.data/test-outbox/${name}` });
	const s3 = await startS3Fake({ port: 0, dir: `.data/test-s3/${name}`, bucket: 'sagwise-files' });
	const server = await startAppServer(PORT, {
		DATABASE_URL: cluster.url(name),
		SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
		SAGWISE_DEV_OUTBOX: smtp.dir,
		S3_ENDPOINT: s3.endpoint,
		S3_BUCKET: 'sagwise-files',
		// Every browser test signs up from this one address; each makes a team of its own.
		SAGWISE_SIGNUPS_PER_CLIENT_HOUR: '100',
	});
	project.provide('appUrl', appUrl);
	project.provide('outboxDir', smtp.dir);

	return async () => {
		await server.stop();
		await smtp.close();
		await s3.close();
		await sql`drop database if exists ${sql.id(name)} with (force)`.execute(admin);
		await admin.destroy();
	};
}
