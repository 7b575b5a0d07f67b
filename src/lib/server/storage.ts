import {
	CreateBucketCommand,
	DeleteObjectCommand,
	GetObjectCommand,
	HeadBucketCommand,
	HeadObjectCommand,
	ListObjectsV2Command,
	PutObjectCommand,
	S3Client,
} from '@aws-sdk/client-s3';
import type { ServerConfig } from './config';
import { StorageUnavailableError } from './unavailable';

export interface Storage {
	put(key: string, body: Uint8Array, contentType: string): Promise<void>;
	get(key: string): Promise<Uint8Array | null>;
	remove(key: string): Promise<void>;
	/** Every key under a prefix (paged through the store's listing). */
	list(prefix: string): Promise<{ key: string; lastModified: Date | null }[]>;
	/** One round trip to the store; throws StorageUnavailableError when it does not answer. */
	ping(): Promise<void>;
}

/** The object the health check asks about (it need not exist). */
const PING_KEY = 'health/ping';

/** How long one storage call may take before it is abandoned: a frozen store must not hang a request. */
export const STORAGE_TIMEOUT_MS = Number(process.env.SAGWISE_S3_TIMEOUT_MS ?? 15_000);

function clientFor(s3: ServerConfig['s3'], timeoutMs: number): S3Client {
	// The SDK release pinned in package.json supports the Node 20 this project runs on; its notice
	// about later releases needing Node 22 would only bury the start command's own output.
	process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';
	return new S3Client({
		region: s3.region,
		endpoint: s3.endpoint ?? undefined,
		forcePathStyle: s3.forcePathStyle,
		credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey },
		// Checksums only where S3 requires them: the local fake stores aws-chunked framing otherwise.
		requestChecksumCalculation: 'WHEN_REQUIRED',
		responseChecksumValidation: 'WHEN_REQUIRED',
		// Connection and socket timeouts inside the SDK; each call also carries an overall deadline.
		requestHandler: { connectionTimeout: Math.min(3000, timeoutMs), requestTimeout: timeoutMs },
		maxAttempts: 2,
	});
}

/**
 * Files (logger CSVs, photos) through the S3 SDK: real S3 in production, the S3-compatible fake on
 * loopback locally. Bodies are whole buffers (the fake mangles streamed, chunk-signed uploads).
 * Every call has a deadline; a failure of the store surfaces as StorageUnavailableError (a 503).
 */
export function createS3Storage(s3: ServerConfig['s3'], timeoutMs = STORAGE_TIMEOUT_MS): Storage {
	const client = clientFor(s3, timeoutMs);
	async function call<T>(
		operation: string,
		run: (abortSignal: AbortSignal) => Promise<T>,
	): Promise<T> {
		try {
			return await run(AbortSignal.timeout(timeoutMs));
		} catch (error) {
			throw new StorageUnavailableError(operation, error);
		}
	}
	return {
		put: (key, body, contentType) =>
			call('upload', async (abortSignal) => {
				await client.send(
					new PutObjectCommand({
						Bucket: s3.bucket,
						Key: key,
						Body: body,
						ContentType: contentType,
						ContentLength: body.byteLength,
					}),
					{ abortSignal },
				);
			}),
		async get(key) {
			try {
				return await call('download', async (abortSignal) => {
					const res = await client.send(new GetObjectCommand({ Bucket: s3.bucket, Key: key }), {
						abortSignal,
					});
					return res.Body ? await res.Body.transformToByteArray() : null;
				});
			} catch (error) {
				if (
					(error as Error).cause &&
					((error as Error).cause as { name?: string }).name === 'NoSuchKey'
				)
					return null;
				throw error;
			}
		},
		remove: (key) =>
			call('delete', async (abortSignal) => {
				await client.send(new DeleteObjectCommand({ Bucket: s3.bucket, Key: key }), {
					abortSignal,
				});
			}),
		list: (prefix) =>
			call('listing', async (abortSignal) => {
				const out: { key: string; lastModified: Date | null }[] = [];
				let token: string | undefined;
				do {
					const page = await client.send(
						new ListObjectsV2Command({
							Bucket: s3.bucket,
							Prefix: prefix,
							ContinuationToken: token,
						}),
						{ abortSignal },
					);
					for (const o of page.Contents ?? [])
						if (o.Key) out.push({ key: o.Key, lastModified: o.LastModified ?? null });
					token = page.IsTruncated ? page.NextContinuationToken : undefined;
				} while (token);
				return out;
			}),
		// One object's head, not the bucket's: the local fake answers HEAD bucket by listing every
		// object in it, so a probe would slow down as the team's files grow. Any answer about the
		// object (there or not) is the store answering.
		ping: () =>
			call('health check', async (abortSignal) => {
				try {
					await client.send(new HeadObjectCommand({ Bucket: s3.bucket, Key: PING_KEY }), {
						abortSignal,
					});
				} catch (error) {
					const status = (error as { $metadata?: { httpStatusCode?: number } }).$metadata
						?.httpStatusCode;
					if (status !== 404 && status !== 403) throw error;
				}
			}),
	};
}

/** Creates the bucket when it is missing (the local fake starts empty). */
export async function ensureBucket(s3: ServerConfig['s3']): Promise<void> {
	const client = clientFor(s3, STORAGE_TIMEOUT_MS);
	try {
		await client.send(new HeadBucketCommand({ Bucket: s3.bucket }));
	} catch {
		await client.send(new CreateBucketCommand({ Bucket: s3.bucket }));
	}
}
