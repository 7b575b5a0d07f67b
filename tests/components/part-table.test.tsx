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
