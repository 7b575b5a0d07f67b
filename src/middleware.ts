import { getSession } from 'auth-astro/server';
import { cachedSessionUser } from '@/lib/server/session-cache';
import { defineMiddleware, sequence } from 'astro:middleware';
import { toAppUser } from '@/lib/server/auth';
import { db } from '@/lib/server/db/index';
import { problem, unavailable } from '@/lib/server/http';
import { signInLimited } from '@/lib/server/rate-limit';
import { randomUUID } from 'node:crypto';
import { busyAnswer } from '@/lib/server/engine/cache';
import { EngineBusy, isAbort } from '@/lib/server/engine/pool';
import { errorField, log } from '@/lib/server/log';
import { httpDuration } from '@/lib/server/metrics';
import { noteRequestActor, runWithRequest } from '@/lib/server/request-context';
import { pageCache } from '@/lib/server/page-cache';
import { securityHeaders } from '@/lib/server/security-headers';
import { config, mailer, storage } from '@/lib/server/services';
import { isDatabaseUnavailable, isStorageUnavailable } from '@/lib/server/unavailable';

type Context = Parameters<Parameters<typeof defineMiddleware>[0]>[0];

const attachServices = defineMiddleware((context, next) => {
	context.locals.db = db;
	context.locals.mailer = mailer;
	context.locals.config = config;
	context.locals.storage = storage;
	context.locals.user = null;
	return next();
});

function clientOf(context: Context): string {
	try {
		return context.clientAddress;
	} catch {
		return 'unknown';
	}
}

/** The path as routing sees it: doubled and trailing slashes folded, case ignored. */
export const normalPath = (pathname: string) =>
	pathname
		.replace(/\/{2,}/g, '/')
		.replace(/(.)\/+$/, '$1')
		.toLowerCase();

/** A request id the client sent that is safe to carry on (else we make our own). */
const SAFE_REQUEST_ID = /^[\w.:-]{8,64}$/;

const TEAM_IN_PATH = /^\/(?:api\/)?teams\/([0-9a-f-]{36})(?:\/|$)/i;

/**
 * The outermost layer: a request id (the client's `x-request-id` when it is a plain token, else a
 * fresh one) on every log line of the request, in the `x-request-id` header of the answer and in
 * every problem body; one access-log line and one latency observation per request; security
 * headers on every answer; a 503 problem (not an HTML 500) while the database or the file store is
 * down, or with Retry-After while the engine's line is full; any other failure of an API route
 * answers a problem too.
 */
const guardResponses = defineMiddleware(async (context, next) => {
	const began = performance.now();
	const https = context.url.protocol === 'https:';
	const api = normalPath(context.url.pathname).startsWith('/api/');
	const sent = context.request.headers.get('x-request-id') ?? '';
	const requestId = SAFE_REQUEST_ID.test(sent) ? sent : randomUUID();
	const facts = { client: clientOf(context), requestId };
	// `//api/...` is no route of ours: refuse it plainly rather than let it reach a page.
	if (/\/\//.test(context.url.pathname))
		return securityHeaders(
			runWithRequest(facts, () => problem(404, 'not_found', 'No such page')),
			https,
		);
	let response: Response;
	let failure: unknown;
	try {
		response = await runWithRequest(facts, () => next());
	} catch (error) {
		failure = error;
		response = runWithRequest(facts, () => {
			if (isDatabaseUnavailable(error)) return unavailable('database');
			if (isStorageUnavailable(error)) return unavailable('storage');
			if (error instanceof EngineBusy) return busyAnswer(error);
			// The client went away while its page was computed: nobody reads this answer.
			if (isAbort(error) && context.request.signal.aborted)
				return new Response(null, { status: 499 });
			if (api)
				return problem(
					500,
					'internal',
					'Something went wrong on our side. Nothing may have been saved; try again.',
				);
			log.error(
				{ method: context.request.method, route: context.routePattern, err: errorField(error) },
				'page failed',
			);
			throw error;
		});
		if (response.status === 503) {
			if (!api && (context.request.headers.get('accept') ?? '').includes('text/html'))
				response = unavailablePage(response);
		}
	}
	response = withHeader(securityHeaders(response, https), 'x-request-id', requestId);
	const route = context.routePattern || 'unmatched';
	const seconds = (performance.now() - began) / 1000;
	httpDuration.observe(
		{ route, method: context.request.method, status: `${Math.floor(response.status / 100)}xx` },
		seconds,
	);
	runWithRequest(facts, () => {
		const line = {
			method: context.request.method,
			route,
			status: response.status,
			ms: Math.round(seconds * 1000),
			...(failure !== undefined && { err: errorField(failure) }),
		};
		if (response.status >= 500 && response.status !== 503) log.error(line, 'request failed');
		else if (failure !== undefined) log.warn(line, 'request refused');
		else log.info(line, 'request');
	});
	return response;
});

/** A person opening a page while a service is down gets a page that says so, not JSON. */
function unavailablePage(problemResponse: Response): Response {
	const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>Sagwise is catching its breath</title></head><body><main><h1>Sagwise cannot reach its data right now</h1><p>The database or the file store is not answering. Nothing you saved before is lost. Try again in a moment: <a href="">reload this page</a>.</p></main></body></html>`;
	const headers = new Headers(problemResponse.headers);
	headers.set('content-type', 'text/html; charset=utf-8');
	return new Response(html, { status: 503, headers });
}

async function emailOfBody(request: Request): Promise<string> {
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	try {
		if (type.includes('application/json')) {
			const body = (await request.clone().json()) as { email?: unknown };
			return typeof body?.email === 'string' ? body.email.trim().toLowerCase() : '';
		}
		const form = await request.clone().formData();
		return String(form.get('email') ?? '')
			.trim()
			.toLowerCase();
	} catch {
		return '';
	}
}

/**
 * Password sign-in goes through Auth.js, whose `authorize` counts every attempt (whatever the path
 * spelling or body type that reached it). This answers 429 up front for a limited address or
 * client, so a blocked caller gets a clear status instead of a redirect.
 */
const limitPasswordSignIn = defineMiddleware(async (context, next) => {
	if (
		context.request.method !== 'POST' ||
		normalPath(context.url.pathname) !== '/api/auth/callback/credentials'
	)
		return next();
	const email = await emailOfBody(context.request);
	if (await signInLimited(context.locals.db, email || '(none)', clientOf(context))) {
		return problem(
			429,
			'rate_limited',
			'Too many failed sign-in attempts. Wait a minute and try again.',
			undefined,
			{ 'retry-after': '60' },
		);
	}
	return next();
});

const SKIP_SESSION = [
	/^\/_astro\//,
	/^\/api\/auth\//,
	/^\/api\/health$/,
	/^\/favicon/,
	/^\/robots\.txt$/,
];

const attachUser = defineMiddleware(async (context, next) => {
	if (!SKIP_SESSION.some((re) => re.test(normalPath(context.url.pathname)))) {
		context.locals.user = await cachedSessionUser(context.request.headers.get('cookie'), async () =>
			toAppUser(await getSession(context.request)),
		);
	}
	// Ids only, for the logs of the rest of this request (access is checked by each route).
	noteRequestActor({
		userId: context.locals.user?.id,
		teamId: TEAM_IN_PATH.exec(context.url.pathname)?.[1]?.toLowerCase(),
	});
	const response = await next();
	// Whose answer this is: the service worker keeps a copy for offline use only while that member
	// is the one signed in on the device, and serves a kept copy only to them (public/sw-user.js).
	const who = context.locals.user?.id;
	return who ? withHeader(response, 'x-sagwise-user', who) : response;
});

/** The response with one more header (a copy when its headers are immutable). */
function withHeader(response: Response, name: string, value: string): Response {
	try {
		response.headers.set(name, value);
		return response;
	} catch {
		const headers = new Headers(response.headers);
		headers.set(name, value);
		return new Response(response.body, {
			status: response.status,
			statusText: response.statusText,
			headers,
		});
	}
}

const APP_PAGES = [/^\/teams(\/|$)/, /^\/account(\/|$)/, /^\/notifications(\/|$)/];

/** Anonymous visitors of app pages go to the sign-in page and come back afterwards. */
const guardPages = defineMiddleware((context, next) => {
	if (!context.locals.user && APP_PAGES.some((re) => re.test(normalPath(context.url.pathname)))) {
		return context.redirect(
			`/sign-in?callbackUrl=${encodeURIComponent(context.url.pathname + context.url.search)}`,
		);
	}
	return next();
});

export const onRequest = sequence(
	attachServices,
	guardResponses,
	limitPasswordSignIn,
	attachUser,
	guardPages,
	pageCache(normalPath),
);
