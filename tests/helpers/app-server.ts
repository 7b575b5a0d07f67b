import { type ChildProcess, spawn } from 'node:child_process';

export interface AppServer {
	url: string;
	process: ChildProcess;
	/** Everything the server wrote to stderr so far. */
	stderr: () => string;
	stop: () => Promise<void>;
}

/** The built app behind its HTTP front (src/cli/serve.ts), as `npm start` runs it, on a test port. */
export async function startAppServer(port: number, env: Record<string, string>): Promise<AppServer> {
	const url = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, ['--import', 'tsx', 'src/cli/serve.ts'], {
		env: { ...process.env, HOST: '127.0.0.1', PORT: String(port), AUTH_SECRET: 'test-secret-not-for-production-0123456789', AUTH_TRUST_HOST: 'true', PUBLIC_URL: url, ...env },
		stdio: ['ignore', 'ignore', 'pipe'],
	});
	let err = '';
	child.stderr!.on('data', (d: Buffer) => {
		err = (err + d.toString()).slice(-200_000);
		if (process.env.SAGWISE_TEST_SERVER_LOG) process.stderr.write(d);
	});
	const deadline = Date.now() + 30_000;
	for (;;) {
		try {
			if ((await fetch(`${url}/api/health`)).ok) break;
		} catch {
			// not up yet
		}
		if (Date.now() > deadline || child.exitCode !== null) throw new Error(`the test server did not start:\n${err.slice(-4000)}`);
		await new Promise((r) => setTimeout(r, 150));
	}
	return {
		url,
		process: child,
		stderr: () => err,
		stop: async () => {
			if (child.exitCode !== null) return;
			child.kill('SIGTERM');
			await new Promise((r) => child.once('exit', r));
		},
	};
}
