/** The S3-compatible fake on loopback (s3rver), for `npm start` and the tests. Never used with real S3. */
import { mkdirSync } from 'node:fs';
import S3rver from 's3rver';

export interface S3Fake {
	endpoint: string;
	close: () => Promise<void>;
}

export async function startS3Fake(opts: {
	port: number;
	dir: string;
	bucket: string;
}): Promise<S3Fake> {
	mkdirSync(opts.dir, { recursive: true });
	const server = new S3rver({
		address: '127.0.0.1',
		port: opts.port,
		directory: opts.dir,
		silent: true,
		configureBuckets: [{ name: opts.bucket, configs: [] }],
	});
	const address = (await server.run()) as { port: number } | [string, number];
	const port = Array.isArray(address) ? address[1] : address.port;
	return { endpoint: `http://127.0.0.1:${port}`, close: () => server.close() };
}
