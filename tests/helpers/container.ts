import { experimental_AstroContainer as AstroContainer } from 'astro/container';
import type { APIRoute } from 'astro';

let container: AstroContainer | undefined;

export type EndpointModule = Partial<Record<'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE', APIRoute>>;

/** Renders an API route through Astro's Container API with injected locals. */
export async function callEndpoint(
	module: EndpointModule,
	init: { request: Request; locals: Partial<App.Locals>; params?: Record<string, string> },
): Promise<Response> {
	container ??= await AstroContainer.create();
	// SAFETY: renderToResponse accepts endpoint modules at run time (routeType 'endpoint'); its
	// declared parameter type only names component factories.
	return container.renderToResponse(module as never, {
		routeType: 'endpoint',
		locals: init.locals as App.Locals,
		params: init.params,
		request: init.request,
	});
}

export function jsonRequest(
	url: string,
	method: string,
	body?: unknown,
	headers: Record<string, string> = {},
): Request {
	return new Request(`http://localhost${url}`, {
		method,
		headers: body === undefined ? headers : { 'content-type': 'application/json', ...headers },
		body: body === undefined ? undefined : JSON.stringify(body),
	});
}
