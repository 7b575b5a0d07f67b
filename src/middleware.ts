import { getSession } from 'auth-astro/server';
import { defineMiddleware, sequence } from 'astro:middleware';
import { toAppUser } from '@/lib/server/auth';
import { db } from '@/lib/server/db/index';
import { problem } from '@/lib/server/http';
import { recordSignInAttempt, signInLimited } from '@/lib/server/rate-limit';
import { config, mailer, storage } from '@/lib/server/services';

const attachServices = defineMiddleware((context, next) => {
	context.locals.db = db;
	context.locals.mailer = mailer;
	context.locals.config = config;
	context.locals.storage = storage;
	context.locals.user = null;
	return next();
});

function clientOf(context: Parameters<Parameters<typeof defineMiddleware>[0]>[0]): string {
	try {
		return context.clientAddress;
	} catch {
		return 'unknown';
	}
}

/** Password sign-in goes through Auth.js; this counts failures in PostgreSQL and refuses with 429. */
const limitPasswordSignIn = defineMiddleware(async (context, next) => {
	if (context.request.method !== 'POST' || context.url.pathname !== '/api/auth/callback/credentials') return next();
	const form = await context.request.clone().formData().catch(() => null);
	const email = String(form?.get('email') ?? '').trim().toLowerCase();
	const client = clientOf(context);
	if (email && (await signInLimited(context.locals.db, email, client))) {
		return problem(429, 'rate_limited', 'Too many failed sign-in attempts. Wait a minute and try again.', undefined, { 'retry-after': '60' });
	}
	const response = await next();
	if (email) {
		// Auth.js answers a failed password with a redirect (or JSON url) carrying ?error=.
		const location = response.headers.get('location') ?? (response.headers.get('content-type')?.includes('json') ? ((await response.clone().json()) as { url?: string }).url : '') ?? '';
		await recordSignInAttempt(context.locals.db, email, client, !/[?&]error=/.test(location));
	}
	return response;
});

const SKIP_SESSION = [/^\/_astro\//, /^\/api\/auth\//, /^\/api\/health$/, /^\/favicon/, /^\/robots\.txt$/];

const attachUser = defineMiddleware(async (context, next) => {
	if (!SKIP_SESSION.some((re) => re.test(context.url.pathname))) {
		context.locals.user = toAppUser(await getSession(context.request));
	}
	return next();
});

const APP_PAGES = [/^\/teams(\/|$)/, /^\/account(\/|$)/];

/** Anonymous visitors of app pages go to the sign-in page and come back afterwards. */
const guardPages = defineMiddleware((context, next) => {
	if (!context.locals.user && APP_PAGES.some((re) => re.test(context.url.pathname))) {
		return context.redirect(`/sign-in?callbackUrl=${encodeURIComponent(context.url.pathname + context.url.search)}`);
	}
	return next();
});

export const onRequest = sequence(attachServices, limitPasswordSignIn, attachUser, guardPages);
