/** Runtime settings from the environment (the start command fills in local defaults). */
export interface ServerConfig {
	publicUrl: string;
	smtpUrl: string;
	mailFrom: string;
	/** Folder of the local SMTP fake's mail, shown at /dev/outbox; null when mail goes out for real. */
	devOutboxDir: string | null;
}

export function readConfig(env: Record<string, string | undefined> = process.env): ServerConfig {
	// The outbox exists only where the start command (or the tests) run the SMTP fake, and never
	// when the deployment says it is production.
	const production = env.SAGWISE_ENV === 'production';
	return {
		publicUrl: (env.PUBLIC_URL ?? `http://${env.HOST ?? '127.0.0.1'}:${env.PORT ?? 4321}`).replace(/\/$/, ''),
		smtpUrl: env.SMTP_URL ?? 'smtp://127.0.0.1:2525',
		mailFrom: env.MAIL_FROM ?? 'Sagwise <no-reply@sagwise.invalid>',
		devOutboxDir: production ? null : (env.SAGWISE_DEV_OUTBOX ?? null),
	};
}
