import { addMonths, format, startOfMonth } from 'date-fns';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, openBrowser, signUpWithTeam } from '../helpers/browser';

const appUrl = inject('appUrl');

/** The events calendar opens where the team's next event is, not on an empty month. */
describe('the events calendar, in chromium', () => {
	let b: Browser;
	let teamId: string;
	beforeAll(async () => {
		b = await openBrowser({ viewport: { width: 1366, height: 768 } });
		await signUpWithTeam(b, appUrl, {
			name: 'Calendar Captain',
			email: `calendar-${Date.now()}@sagwise.test`,
			password: 'calendar-captain-2026',
			team: `Calendar Team ${Date.now()}`,
		});
		teamId = /\/teams\/([0-9a-f-]{36})/.exec(b.page.url())![1]!;
	}, 120_000);
	afterAll(async () => b?.close());

	const heading = async (path = '') => {
		await b.page.goto(`${appUrl}/teams/${teamId}/events${path}`);
		return b.page.locator('#cal-heading').innerText();
	};
	const addEvent = async (on: Date, name: string) => {
		const day = format(on, 'yyyy-MM-dd');
		const res = await b.page.request.fetch(`${appUrl}/api/teams/${teamId}/events`, {
			method: 'POST',
			headers: { Origin: appUrl, 'content-type': 'application/json' },
			data: JSON.stringify({ name, startsOn: day, endsOn: day }),
		});
		expect(res.status()).toBe(201);
	};

	it('opens on this month with no event, on the next event’s month when this one is empty, and this month when it has one', async () => {
		const now = startOfMonth(new Date());
		expect(await heading()).toBe(format(now, 'MMMM yyyy'));
		const later = addMonths(now, 3);
		await addEvent(addMonths(later, 0), 'Spring round');
		expect(await heading()).toBe(format(later, 'MMMM yyyy'));
		await expect(b.page.getByText('Spring round').first().isVisible()).resolves.toBe(true);
		// The way back to this month is there, and a month asked for is the month shown.
		await b.page.getByRole('link', { name: 'This month' }).click();
		await expect(b.page.locator('#cal-heading').innerText()).resolves.toBe(
			format(now, 'MMMM yyyy'),
		);
		// An event this month: the calendar stays here.
		await addEvent(new Date(), 'Club night');
		expect(await heading()).toBe(format(now, 'MMMM yyyy'));
	}, 60_000);
});
