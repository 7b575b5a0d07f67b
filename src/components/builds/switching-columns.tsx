import { ISOLATOR_KINDS, ISOLATOR_STATES, type DcDcCharger, type Isolator } from '@/engine/browser';
import { label, linkEnd, num, type Opt } from './column-kit';
import type { PartColumn } from './PartTable';

const ISOLATOR_KIND_LABELS: Record<Isolator['kind'], string> = {
	relay: 'relay (both ways)',
	diode: 'diode (one way)',
};
const ISOLATOR_STATE_LABELS: Record<Isolator['closes'], string> = {
	engine_running: 'with the engine running',
	always: 'always',
	open: 'never (open)',
};

export function isolatorColumns(nodes: Opt): PartColumn<Isolator>[] {
	return [
		label('Relay or isolator'),
		linkEnd<Isolator>(nodes, 'from', 'From (supply side)'),
		linkEnd<Isolator>(nodes, 'to', 'To'),
		{
			id: 'kind',
			header: 'Kind',
			errorPath: 'kind',
			cell: {
				kind: 'select',
				get: (x) => x.kind,
				// A diode without a drop is no diode: switching to one starts it at a common 0.7 V
				// (a silicon junction; common practice, no published source); a relay has none.
				set: (x, v) =>
					v === 'diode'
						? { ...x, kind: 'diode', forwardDropV: x.forwardDropV || 0.7 }
						: { ...x, kind: 'relay', forwardDropV: 0 },
				options: ISOLATOR_KINDS.map((k) => ({ value: k, label: ISOLATOR_KIND_LABELS[k] })),
			},
		},
		{
			id: 'closes',
			header: 'Conducts',
			errorPath: 'closes',
			cell: {
				kind: 'select',
				get: (x) => x.closes,
				set: (x, v) => ({ ...x, closes: v as Isolator['closes'] }),
				options: ISOLATOR_STATES.map((k) => ({ value: k, label: ISOLATOR_STATE_LABELS[k] })),
			},
		},
		{
			id: 'closedResistance',
			header: 'Closed resistance',
			unit: 'mΩ',
			errorPath: 'closedResistanceOhm',
			cell: {
				kind: 'number',
				step: '0.01',
				get: (x) => x.closedResistanceOhm * 1000,
				set: (x, v) => ({ ...x, closedResistanceOhm: num(v) / 1000 }),
			},
		},
		{
			id: 'forwardDrop',
			header: 'Forward drop',
			unit: 'V',
			errorPath: 'forwardDropV',
			cell: {
				kind: 'number',
				step: '0.01',
				get: (x) => x.forwardDropV,
				set: (x, v) => ({ ...x, forwardDropV: num(v) }),
			},
		},
	];
}

export function chargerColumns(nodes: Opt): PartColumn<DcDcCharger>[] {
	return [
		label('DC-DC charger'),
		linkEnd<DcDcCharger>(nodes, 'from', 'Input from'),
		linkEnd<DcDcCharger>(nodes, 'to', 'Output to'),
		{
			id: 'targetV',
			header: 'Target',
			unit: 'V',
			errorPath: 'targetV',
			cell: {
				kind: 'number',
				step: '0.1',
				get: (x) => x.targetV,
				set: (x, v) => ({ ...x, targetV: num(v) }),
			},
		},
		{
			id: 'maxOutputA',
			header: 'Output limit',
			unit: 'A',
			errorPath: 'maxOutputA',
			cell: {
				kind: 'number',
				get: (x) => x.maxOutputA,
				set: (x, v) => ({ ...x, maxOutputA: num(v) }),
			},
		},
		{
			id: 'efficiency',
			header: 'Efficiency',
			unit: '%',
			errorPath: 'efficiency',
			cell: {
				kind: 'number',
				get: (x) => x.efficiency * 100,
				set: (x, v) => ({ ...x, efficiency: num(v) / 100 }),
			},
		},
		{
			id: 'runs',
			header: 'Runs',
			errorPath: 'runs',
			cell: {
				kind: 'select',
				get: (x) => x.runs,
				set: (x, v) => ({ ...x, runs: v as DcDcCharger['runs'] }),
				options: ISOLATOR_STATES.map((k) => ({ value: k, label: ISOLATOR_STATE_LABELS[k] })),
			},
		},
	];
}
