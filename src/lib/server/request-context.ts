import { AsyncLocalStorage } from 'node:async_hooks';

/**
 * Facts about the request being served that code deep inside a library callback needs (the
 * Auth.js `authorize` and mail callbacks see no Astro context): the client's address, as the
 * server decided it (the forwarded address only behind a trusted proxy); the request's id, which
 * every log line and every problem answer carries; and, once known, the signed-in user's and the
 * team's ids (ids only: the logs never hold names or addresses).
 */
export interface RequestFacts {
	client: string;
	requestId: string;
	userId?: string;
	teamId?: string;
}

const store = new AsyncLocalStorage<RequestFacts>();

export const runWithRequest = <T>(facts: RequestFacts, fn: () => T): T => store.run(facts, fn);

/** The request being served, if any. */
export const currentRequest = (): RequestFacts | undefined => store.getStore();

/** The client's address of the request being served, or 'unknown' outside one. */
export const currentClient = (): string => store.getStore()?.client ?? 'unknown';

/** The id of the request being served (absent outside one). */
export const currentRequestId = (): string | undefined => store.getStore()?.requestId;

/** Notes who is asking and for which team, for the logs of the rest of this request. */
export function noteRequestActor(facts: { userId?: string; teamId?: string }): void {
	const r = store.getStore();
	if (!r) return;
	if (facts.userId) r.userId = facts.userId;
	if (facts.teamId) r.teamId = facts.teamId;
}
