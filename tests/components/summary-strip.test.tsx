// @vitest-environment jsdom
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { SummaryStrip } from '@/components/builds/analysis/SummaryStrip';
import { buildReport, type BuildReport } from '@/engine';
import { marlinBuild } from '../../db/demo/builds';

type Ok = Extract<BuildReport, { ok: true }>;
const report = (scenario: Parameters<typeof buildReport>[1]) => {
	const r = buildReport(marlinBuild, scenario);
	if (!r.ok) throw new Error('the demo build must compute');
	return r as Ok;
};

describe('the summary strip', () => {
	it('says which way the banks carry the music current, before and after, in words', () => {
		// At a fast engine the alternator carries the music and tops up the banks (current in); with
		// the engine stopped the banks give all of it (current out).
		const running = report({ engineRpm: 3000 });
		const stopped = report({ engineRpm: 0 });
		expect(running.sustained.banks.reduce((s, b) => s + b.currentA, 0)).toBeLessThan(0);
		expect(stopped.sustained.banks.reduce((s, b) => s + b.currentA, 0)).toBeGreaterThan(0);
		const { container } = render(
			<SummaryStrip report={stopped} baseline={running} stale={false} partLabel={() => 'x'} />,
		);
		const bank = container.querySelector<HTMLElement>('[data-figure="bank"]')!;
		expect(bank.querySelector('p.num')!.textContent).toMatch(/^\d+ A out$/);
		const change = container.querySelector('[data-figure="bank"] [data-change]')!;
		expect(change.getAttribute('data-change')).toBe('worse');
		expect(change.textContent).toMatch(/^\d+ in → \d+ out/);
		// Both labels are there: the full one for wide screens and readers, the short one for phones.
		expect(screen.getAllByText('Banks at music level').length).toBe(1);
		expect(screen.getAllByText('Banks').length).toBe(1);
	});
});
