// @vitest-environment jsdom
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { useState } from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { cableColumns } from '@/components/builds/editor-columns';
import { PartTable } from '@/components/builds/PartTable';
import type { Cable } from '@/engine';
import type { UnitSystem } from '@/lib/format';

afterEach(cleanup);

const cable: Cable = {
	id: 'run',
	label: 'Run',
	from: 'a',
	to: 'b',
	size: { kind: 'awg', awg: '4' },
	material: 'copper',
	// 17 ft exactly (0.3048 m per ft, the international foot of 1959).
	lengthM: 17 * 0.3048,
	parallelRuns: 1,
	fuses: [],
	insulationC: 105,
};

function Harness({ units, onLength }: { units: UnitSystem; onLength: (m: number) => void }) {
	const [rows, setRows] = useState([cable]);
	const nodes = [
		{ value: 'a', label: 'A' },
		{ value: 'b', label: 'B' },
	];
	return (
		<PartTable
			caption="Cables"
			rows={rows}
			columns={cableColumns(nodes, units)}
			pathPrefix="cables"
			errors={{}}
			readOnly={false}
			onChange={(i, next) => {
				onLength(next.lengthM);
				setRows((r) => r.map((x, j) => (j === i ? next : x)));
			}}
		/>
	);
}

describe('cable lengths in the editor', () => {
	it('shows metres to 2 decimals and feet to 1, and keeps every digit the member types', () => {
		let stored = cable.lengthM;
		const { unmount } = render(<Harness units="metric" onLength={(m) => (stored = m)} />);
		const metric = screen.getByLabelText('Run: Length') as HTMLInputElement;
		// 17 ft = 5.1816 m, shown as people measure it.
		expect(metric.value).toBe('5.18');
		fireEvent.change(metric, { target: { value: '5.125' } });
		expect(metric.value).toBe('5.125');
		expect(stored).toBeCloseTo(5.125, 12);
		unmount();

		render(<Harness units="imperial" onLength={(m) => (stored = m)} />);
		const imperial = screen.getByLabelText('Run: Length') as HTMLInputElement;
		expect(imperial.value).toBe('17');
		fireEvent.change(imperial, { target: { value: '16.25' } });
		expect(imperial.value).toBe('16.25');
		expect(stored).toBeCloseTo(16.25 * 0.3048, 12);
	});
});

describe('a long part table', () => {
	const many = (n: number) =>
		Array.from({ length: n }, (_, i) => ({ ...cable, id: `c${i}`, label: `Cable ${i + 1}` }));
	const nodes = [
		{ value: 'a', label: 'A' },
		{ value: 'b', label: 'B' },
	];
	const table = (rows: Cable[]) => (
		<PartTable
			caption="Cables"
			rows={rows}
			columns={cableColumns(nodes, 'metric')}
			pathPrefix="cables"
			errors={{}}
			readOnly={false}
			onChange={() => undefined}
		/>
	);

	it('shows 50 rows a page, pages on, and shows the page of a part just added', () => {
		const { rerender, container } = render(table(many(120)));
		const rows = () => [...container.querySelectorAll('tbody tr')];
		expect(rows()).toHaveLength(50);
		expect(screen.getByText('Rows 1–50 of 120')).toBeTruthy();
		fireEvent.click(screen.getByRole('button', { name: 'Next →' }));
		expect(screen.getByText('Rows 51–100 of 120')).toBeTruthy();
		expect(screen.getByLabelText('Cable 51: Length')).toBeTruthy();
		// A part added at the end: the last page, with the new part on it.
		rerender(table(many(121)));
		expect(screen.getByText('Rows 101–121 of 121')).toBeTruthy();
		expect(screen.getByLabelText('Cable 121: Length')).toBeTruthy();
		expect(rows()).toHaveLength(21);
		// A short group has no pages at all.
		rerender(table(many(3)));
		expect(rows()).toHaveLength(3);
		expect(screen.queryByRole('button', { name: 'Next →' })).toBeNull();
	});
});
