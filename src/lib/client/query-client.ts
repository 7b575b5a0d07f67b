import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { type ComponentType, createElement } from 'react';
import { ApiError } from './api-client';

function makeQueryClient(): QueryClient {
	return new QueryClient({
		defaultOptions: {
			queries: {
				staleTime: 30_000,
				// Do not retry answers that will not change: not signed in, forbidden, missing.
				retry: (count, error) =>
					!(error instanceof ApiError && error.status >= 400 && error.status < 500) && count < 2,
			},
			// A write is tried even when the browser says it is offline: a failed one then lands in the
			// outbox (src/lib/client/outbox.ts) instead of hanging as a paused mutation.
			mutations: { networkMode: 'always' },
		},
	});
}

let browserClient: QueryClient | undefined;

/** New client per server render; one shared client in the browser so islands share a cache. */
export function getQueryClient(): QueryClient {
	if (typeof window === 'undefined') return makeQueryClient();
	return (browserClient ??= makeQueryClient());
}

/** An island with the shared query client around it (islands mount alone, each needs the provider). */
export function withQueryClient<P extends object>(Island: ComponentType<P>): ComponentType<P> {
	function WithQueryClient(props: P) {
		return createElement(
			QueryClientProvider,
			{ client: getQueryClient() },
			createElement(Island, props),
		);
	}
	WithQueryClient.displayName = `WithQueryClient(${Island.displayName ?? Island.name})`;
	return WithQueryClient;
}
