import type { PartColumn } from './PartTable';

/** What the part tables' column definitions share. */
export type Opt = Array<{ value: string; label: string }>;

/** A number field's value for the document: a blank field is NaN, which the schema refuses by name. */
export const num = (v: number | null) => (v === null ? Number.NaN : v);

/** The positive and negative terminal columns of a two-terminal part. */
export const terminals = <T extends { positive: string; negative: string }>(
	nodes: Opt,
): PartColumn<T & { id: string; label: string }>[] => [
	{
		id: 'positive',
		header: '+',
		errorPath: 'positive',
		cell: {
			kind: 'select',
			get: (p) => p.positive,
			set: (p, v) => ({ ...p, positive: v }),
			options: nodes,
		},
	},
	{
		id: 'negative',
		header: '−',
		errorPath: 'negative',
		cell: {
			kind: 'select',
			get: (p) => p.negative,
			set: (p, v) => ({ ...p, negative: v }),
			options: nodes,
		},
	},
];
/** A part's name column, headed as its kind. */
export const label = <T extends { label: string; id: string }>(header: string): PartColumn<T> => ({
	id: 'label',
	header,
	errorPath: 'label',
	cell: { kind: 'text', get: (p) => p.label, set: (p, v) => ({ ...p, label: v }) },
});

/** One end of a part that joins two nodes (a relay's, a charger's): a choice of node. */
export const linkEnd = <T extends { from: string; to: string; id: string; label: string }>(
	nodes: Opt,
	key: 'from' | 'to',
	header: string,
): PartColumn<T> => ({
	id: key,
	header,
	errorPath: key,
	cell: {
		kind: 'select',
		get: (x) => x[key],
		set: (x, v) => ({ ...x, [key]: v }),
		options: nodes,
	},
});
