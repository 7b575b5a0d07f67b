import { describe, expect, it, vi } from 'vitest';
import {
	cachedSessionUser,
	forgetSessionsOf,
	sessionCookieOf,
} from '../../src/lib/server/session-cache';

const ana = { id: 'u-ana', email: 'ana@example.test', name: 'Ana' };
const ben = { id: 'u-ben', email: 'ben@example.test', name: 'Ben' };

describe('the session check kept for a few seconds', () => {
	it('reads nobody, and asks nothing, without a session cookie', async () => {
		const read = vi.fn(async () => ana);
		await expect(cachedSessionUser('theme=dark; csrf=abc', read)).resolves.toBeNull();
		await expect(cachedSessionUser(null, read)).resolves.toBeNull();
		expect(read).not.toHaveBeenCalled();
	});

	it('keys by the session cookie alone: other cookies changing do not matter, another session does', async () => {
		expect(sessionCookieOf('a=1; authjs.session-token=T1; b=2')).toBe('authjs.session-token=T1');
		const readAna = vi.fn(async () => ana);
		const readBen = vi.fn(async () => ben);
		const t = 1_000_000;
		await expect(cachedSessionUser('authjs.session-token=A1; x=1', readAna, t)).resolves.toEqual(
			ana,
		);
		await expect(
			cachedSessionUser('x=2; authjs.session-token=A1', readAna, t + 500),
		).resolves.toEqual(ana);
		expect(readAna).toHaveBeenCalledTimes(1);
		// Someone else signs in on the same phone: a new cookie, checked afresh, never Ana's answer.
		await expect(cachedSessionUser('authjs.session-token=B1', readBen, t + 600)).resolves.toEqual(
			ben,
		);
		expect(readBen).toHaveBeenCalledTimes(1);
	});

	it('checks again after ten seconds, and does not keep a refused session', async () => {
		const t = 2_000_000;
		const read = vi.fn(async () => ana);
		await cachedSessionUser('authjs.session-token=A2', read, t);
		await cachedSessionUser('authjs.session-token=A2', read, t + 9_999);
		expect(read).toHaveBeenCalledTimes(1);
		await cachedSessionUser('authjs.session-token=A2', read, t + 10_000);
		expect(read).toHaveBeenCalledTimes(2);
		const refused = vi.fn(async () => null);
		await cachedSessionUser('authjs.session-token=X', refused, t);
		await cachedSessionUser('authjs.session-token=X', refused, t + 1);
		expect(refused).toHaveBeenCalledTimes(2);
	});

	it('ends at once when the account’s sessions end (a password reset)', async () => {
		const t = Date.now();
		const read = vi.fn(async () => ana);
		await cachedSessionUser('authjs.session-token=A3', read, t);
		forgetSessionsOf(ana.id, t + 1);
		const refused = vi.fn(async () => null);
		await expect(cachedSessionUser('authjs.session-token=A3', refused, t + 2)).resolves.toBeNull();
		expect(refused).toHaveBeenCalledTimes(1);
	});

	it('does not keep an answer read before the sessions ended', async () => {
		const t = 3_000_000;
		let finish!: () => void;
		const slow = vi.fn(() => new Promise<typeof ana>((resolve) => (finish = () => resolve(ana))));
		const pending = cachedSessionUser('authjs.session-token=A4', slow, t);
		forgetSessionsOf(ana.id, t + 5);
		finish();
		await pending;
		const again = vi.fn(async () => null);
		await expect(cachedSessionUser('authjs.session-token=A4', again, t + 10)).resolves.toBeNull();
		expect(again).toHaveBeenCalledTimes(1);
	});
});
