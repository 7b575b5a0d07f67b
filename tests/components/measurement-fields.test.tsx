// @vitest-environment jsdom
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { useState } from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { MeasurementFields } from '@/components/runs/MeasurementFields';
import {
	MEASUREMENT_FIELDS,
	measurementsFromTexts,
	measurementTexts,
	RUN_MEASUREMENTS,
} from '@/lib/schemas/run-measurements';
import { newRunSchema } from '@/lib/schemas/runs';

afterEach(cleanup);

function Harness({
	onNumbers,
}: {
	onNumbers: (n: ReturnType<typeof measurementsFromTexts>) => void;
}) {
	const [texts, setTexts] = useState(() => measurementTexts());
	return (
		<MeasurementFields
			values={texts}
			errors={{}}
			onChange={(f, v) =>
				setTexts((t) => {
					const next = { ...t, [f]: v };
					onNumbers(measurementsFromTexts(next));
					return next;
				})
			}
		/>
	);
}

describe('run measurement fields', () => {
	it('show one labelled field per measurement in the definition', () => {
		render(<Harness onNumbers={() => {}} />);
		for (const f of MEASUREMENT_FIELDS)
			expect(
				screen.getByLabelText(`${RUN_MEASUREMENTS[f].label} (${RUN_MEASUREMENTS[f].unit})`),
			).toBeTruthy();
	});

	it('read blank as not measured and a decimal comma as a point', () => {
		let last: ReturnType<typeof measurementsFromTexts> | null = null;
		render(<Harness onNumbers={(n) => (last = n)} />);
		fireEvent.change(screen.getByLabelText('Minimum voltage (V)'), { target: { value: '11,8' } });
		expect(last).toMatchObject({ minV: 11.8, scoreDb: null });
		fireEvent.change(screen.getByLabelText('Minimum voltage (V)'), { target: { value: '' } });
		expect(last).toMatchObject({ minV: null });
	});

	it('leave a mistyped number for the schema to refuse in words', () => {
		const numbers = measurementsFromTexts({ ...measurementTexts(), scoreDb: '14x' });
		const parsed = newRunSchema.safeParse({
			vehicleId: crypto.randomUUID(),
			ranAt: new Date().toISOString(),
			...numbers,
		});
		expect(parsed.success).toBe(false);
		expect(parsed.error!.issues[0]).toMatchObject({
			path: ['scoreDb'],
			message: 'Score must be a number',
		});
	});
});
