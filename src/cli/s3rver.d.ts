// s3rver ships no types; only what src/cli/s3-fake.ts uses.
declare module 's3rver' {
	interface S3rverOptions {
		address?: string;
		port?: number;
		directory: string;
		silent?: boolean;
		configureBuckets?: Array<{ name: string; configs: unknown[] }>;
	}
	export default class S3rver {
		constructor(options: S3rverOptions);
		run(): Promise<unknown>;
		close(): Promise<void>;
	}
}
