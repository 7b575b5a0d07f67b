import { CreateBucketCommand, DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import type { ServerConfig } from './config';

export interface Storage {
	put(key: string, body: Uint8Array, contentType: string): Promise<void>;
	get(key: string): Promise<Uint8Array | null>;
	remove(key: string): Promise<void>;
}

/**
 * Files (logger CSVs, photos) through the S3 SDK: real S3 in production, the S3-compatible fake on
 * loopback locally. Bodies are whole buffers (the fake mangles streamed, chunk-signed uploads).
 */
export function createS3Storage(s3: ServerConfig['s3']): Storage {
	const client = new S3Client({
		region: s3.region,
		endpoint: s3.endpoint ?? undefined,
		forcePathStyle: s3.forcePathStyle,
		credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey },
		// Checksums only where S3 requires them: the local fake stores aws-chunked framing otherwise.
		requestChecksumCalculation: 'WHEN_REQUIRED',
		responseChecksumValidation: 'WHEN_REQUIRED',
	});
	return {
		async put(key, body, contentType) {
			await client.send(new PutObjectCommand({ Bucket: s3.bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.byteLength }));
		},
		async get(key) {
			try {
				const res = await client.send(new GetObjectCommand({ Bucket: s3.bucket, Key: key }));
				return res.Body ? await res.Body.transformToByteArray() : null;
			} catch (error) {
				if ((error as { name?: string }).name === 'NoSuchKey') return null;
				throw error;
			}
		},
		async remove(key) {
			await client.send(new DeleteObjectCommand({ Bucket: s3.bucket, Key: key }));
		},
	};
}

/** Creates the bucket when it is missing (the local fake starts empty). */
export async function ensureBucket(s3: ServerConfig['s3']): Promise<void> {
	const client = new S3Client({ region: s3.region, endpoint: s3.endpoint ?? undefined, forcePathStyle: s3.forcePathStyle, credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey } });
	try {
		await client.send(new HeadBucketCommand({ Bucket: s3.bucket }));
	} catch {
		await client.send(new CreateBucketCommand({ Bucket: s3.bucket }));
	}
}
