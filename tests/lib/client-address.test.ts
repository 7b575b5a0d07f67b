import type http from 'node:http';
import { describe, expect, it } from 'vitest';
import { clientAddress, parseTrustedProxies } from '../../src/cli/serve';
import { bodyLimitFor, DEFAULT_BODY_LIMIT } from '../../src/lib/server/body-limits';

const req = (remoteAddress: string, forwarded?: string) =>
	({
		socket: { remoteAddress },
		headers: forwarded ? { 'x-forwarded-for': forwarded } : {},
	}) as unknown as http.IncomingMessage;

describe('which address a request comes from', () => {
	it('ignores X-Forwarded-For unless the socket is a proxy named in TRUST_PROXY', () => {
		const none = parseTrustedProxies(undefined);
		expect(clientAddress(req('198.51.100.7', '203.0.113.9'), none)).toBe('198.51.100.7');
		expect(clientAddress(req('127.0.0.1', '203.0.113.9'), parseTrustedProxies('false'))).toBe(
			'127.0.0.1',
		);
	});

	it('behind trusted proxies takes the nearest address that is not one of them, so a client cannot prepend its own', () => {
		const trusted = parseTrustedProxies('loopback,10.0.0.2');
		expect(clientAddress(req('127.0.0.1', '203.0.113.9'), trusted)).toBe('203.0.113.9');
		// The client wrote "1.2.3.4" itself; the proxy appended the address it saw.
		expect(clientAddress(req('10.0.0.2', '1.2.3.4, 203.0.113.9'), trusted)).toBe('203.0.113.9');
		expect(clientAddress(req('::ffff:127.0.0.1', 'not-an-ip, 198.51.100.1'), trusted)).toBe(
			'198.51.100.1',
		);
	});

	it('gives each route its body limit whatever the path spelling', () => {
		expect(bodyLimitFor('POST', '/api/auth/callback/credentials')).toBe(64 * 1024);
		expect(bodyLimitFor('POST', '/API/Auth/callback/credentials/')).toBe(64 * 1024);
		expect(bodyLimitFor('POST', '/api/teams/x/events')).toBe(DEFAULT_BODY_LIMIT);
		expect(bodyLimitFor('POST', '/api/teams/import')).toBeGreaterThan(200 * 1024 * 1024);
	});
});
