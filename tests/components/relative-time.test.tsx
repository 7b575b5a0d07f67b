// @vitest-environment jsdom
import { act } from 'react';
import { renderToString } from 'react-dom/server';
import { hydrateRoot } from 'react-dom/client';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { RelativeTime } from '@/components/ui/RelativeTime';

afterEach(() => {
	vi.useRealTimers();
});

describe('relative times in islands', () => {
	it('wake without a hydration mismatch when a minute passed between the server page and the browser', async () => {
		(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;
		const savedAt = '2026-11-20T10:00:00Z';
		vi.useFakeTimers({ toFake: ['Date'] });
		// Rendered on the server 29 s after the save ("less than a minute ago" then) ...
		vi.setSystemTime(new Date('2026-11-20T10:00:29Z'));
		const html = renderToString(<RelativeTime at={savedAt} />);
		expect(html).toContain('on 20 Nov 2026');
		expect(html).toContain('dateTime="2026-11-20T10:00:00.000Z"');
		// ... and woken in the browser past the minute's boundary, from a slow network or a kept copy.
		vi.setSystemTime(new Date('2026-11-20T10:03:10Z'));
		const el = document.createElement('div');
		el.innerHTML = html;
		document.body.append(el);
		const recoverable: unknown[] = [];
		await act(async () => {
			hydrateRoot(el, <RelativeTime at={savedAt} />, {
				onRecoverableError: (e) => recoverable.push(e),
			});
		});
		expect(recoverable).toEqual([]);
		expect(el.textContent).toBe('3 minutes ago');
	});

	it('shows a dash for a time it cannot read', () => {
		expect(renderToString(<RelativeTime at="not a time" />)).toBe('—');
	});
});
