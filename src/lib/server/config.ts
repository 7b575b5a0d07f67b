import { randomBytes } from 'node:crypto';

/** Runtime settings from the environment (the start command fills in local defaults). */
export interface ServerConfig {
	publicUrl: string;
	smtpUrl: string;
	mailFrom: string;
	/** Folder of the local SMTP fake's mail, shown at /dev/outbox; null when mail goes out for real. */
	devOutboxDir: string | null;
	/** Signs the one-click unsubscribe links in mail (the auth secret; a fresh one per process without it). */
	linkSigningKey: string;
	s3: {
		endpoint: string | null;
		region: string;
		bucket: string;
		accessKeyId: string;
		secretAccessKey: string;
		forcePathStyle: boolean;
	};
}

export function readConfig(env: Record<string, string | undefined> = process.env): ServerConfig {
	// The outbox exists only where the start command (or the tests) run the SMTP fake, and never
	// when the deployment says it is production.
	const production = env.SAGWISE_ENV === 'production';
	return {
		publicUrl: (env.PUBLIC_URL ?? `http://${env.HOST ?? '127.0.0.1'}:${env.PORT ?? 4321}`).replace(
			/\/$/,
			'',
		),
		smtpUrl: env.SMTP_URL ?? 'smtp://127.0.0.1:2525',
		mailFrom: env.MAIL_FROM ?? 'Sagwise <no-reply@sagwise.invalid>',
		devOutboxDir: production ? null : (env.SAGWISE_DEV_OUTBOX ?? null),
		linkSigningKey: env.AUTH_SECRET || randomBytes(32).toString('hex'),
		s3: {
			// Unset: the local fake. Set to an empty string: AWS's own endpoint for the region.
			endpoint: env.S3_ENDPOINT === '' ? null : (env.S3_ENDPOINT ?? 'http://127.0.0.1:4569'),
			region: env.S3_REGION ?? 'us-east-1',
			bucket: env.S3_BUCKET ?? 'sagwise-files',
			accessKeyId: env.S3_ACCESS_KEY_ID ?? 'S3RVER',
			secretAccessKey: env.S3_SECRET_ACCESS_KEY ?? 'S3RVER',
			forcePathStyle: (env.S3_FORCE_PATH_STYLE ?? 'true') === 'true',
		},
	};
}
