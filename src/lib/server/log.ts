import { pino } from 'pino';
import { currentRequest } from './request-context';

/**
 * The server's one logger: JSON lines on stdout, one object per event. Every line written while a
 * request is served carries its id (`reqId`) and, once known, the user's and team's ids — never
 * names, e-mail addresses, passwords or tokens (the redaction below drops them wherever they hide).
 * `LOG_LEVEL` sets the level (info by default; `silent` in the test run unless asked otherwise).
 */
export const log = pino({
	level: process.env.LOG_LEVEL ?? (process.env.VITEST ? 'silent' : 'info'),
	base: { service: 'sagwise' },
	timestamp: pino.stdTimeFunctions.isoTime,
	formatters: { level: (label) => ({ level: label }) },
	mixin() {
		const r = currentRequest();
		if (!r) return {};
		return {
			reqId: r.requestId,
			...(r.userId && { userId: r.userId }),
			...(r.teamId && { teamId: r.teamId }),
		};
	},
	redact: {
		paths: [
			'password',
			'*.password',
			'token',
			'*.token',
			'authorization',
			'*.authorization',
			'cookie',
			'*.cookie',
			'headers.cookie',
			'headers.authorization',
			'secret',
			'*.secret',
		],
		censor: '[redacted]',
	},
});

/** An error as a log field: its name, message and (outside production) its stack. */
export const errorField = (error: unknown) =>
	error instanceof Error
		? { name: error.name, message: error.message, stack: error.stack }
		: { message: String(error) };
