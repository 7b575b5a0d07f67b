import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { type Browser, openBrowser } from '../helpers/browser';

describe('landing page in chromium', () => {
	let browser: Browser;
	const appUrl = inject('appUrl');

	beforeAll(async () => {
		browser = await openBrowser();
	});
	afterAll(async () => {
		await browser?.close();
	});

	it('shows what Sagwise does and the safety caution, with no console errors', async () => {
		const { page } = browser;
		const response = await page.goto(appUrl, { waitUntil: 'networkidle' });
		expect(response?.status()).toBe(200);
		await expect(page.locator('h1').textContent()).resolves.toMatch(/volt/i);
		await expect(page.locator('footer').textContent()).resolves.toMatch(/Fuse every cable/);
		// The shipped font loaded (no CDN involved).
		const fontLoaded = await page.evaluate(async () => {
			await document.fonts.ready;
			return document.fonts.check('16px "Public Sans Variable"');
		});
		expect(fontLoaded).toBe(true);
		const file = await browser.screenshot('landing');
		expect(existsSync(file)).toBe(true);
		// A newcomer's way in: the landing page leads to making an account.
		await page.getByRole('link', { name: 'Create an account' }).click();
		await page.waitForURL(/\/sign-up$/);
		await expect(page.locator('h1').textContent()).resolves.toMatch(/account/i);
		expect(browser.problems).toEqual([]);
	});

	it('answers an unknown address with the 404 page', async () => {
		const response = await browser.page.goto(`${appUrl}/no-such-page`);
		expect(response?.status()).toBe(404);
		await expect(browser.page.locator('h1').textContent()).resolves.toMatch(/Open circuit/);
	});
});
