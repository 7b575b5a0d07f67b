import { AsyncLocalStorage } from 'node:async_hooks';

/**
 * Facts about the request being served that code deep inside a library callback needs (the
 * Auth.js `authorize` and mail callbacks see no Astro context): the client's address, as the
 * server decided it (the forwarded address only behind a trusted proxy).
 */
export interface RequestFacts {
	client: string;
}

const store = new AsyncLocalStorage<RequestFacts>();

export const runWithRequest = <T>(facts: RequestFacts, fn: () => T): T => store.run(facts, fn);

/** The client's address of the request being served, or 'unknown' outside one. */
export const currentClient = (): string => store.getStore()?.client ?? 'unknown';
