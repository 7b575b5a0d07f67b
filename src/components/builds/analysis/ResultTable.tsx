import { type ReactNode, useState } from 'react';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

/** One column of a results table: its heading, how a row fills it, and how it lines up. */
export interface ResultColumn<Row> {
	key: string;
	header: ReactNode;
	cell: (row: Row) => ReactNode;
	align?: 'left' | 'right';
	/** Extra classes for a row's cell (a colour for a figure out of bounds, say). */
	tone?: (row: Row) => string;
	/** Figures in tabular digits (the default); text columns set false. */
	numeric?: boolean;
}

/**
 * The read-only table every analysis section uses (budget, amplifiers, cables): one look, one
 * set of header semantics, horizontal scroll on narrow screens instead of a page that scrolls.
 */
export function ResultTable<Row>({
	rows,
	rowKey,
	columns,
	caption,
	label,
	rowProps,
	className = '',
}: {
	rows: Row[];
	rowKey: (row: Row) => string | number;
	columns: ResultColumn<Row>[];
	caption?: string;
	label?: string;
	rowProps?: (row: Row) => Record<string, string>;
	className?: string;
}) {
	// A build at the limits has a thousand cables: the first hundred rows, the rest on request.
	const [all, setAll] = useState(false);
	const shown = all || rows.length <= RESULT_ROWS_SHOWN ? rows : rows.slice(0, RESULT_ROWS_SHOWN);
	return (
		<>
			<ScrollRegion
				label={label ?? caption ?? 'Results'}
				className={`rounded-md border border-hairline bg-card ${className}`}
			>
				<table className="w-full text-sm" aria-label={label}>
					{caption && <caption className="sr-only">{caption}</caption>}
					<thead className="bg-paper text-xs text-ink-soft">
						<tr>
							{columns.map((c) => (
								<th
									key={c.key}
									scope="col"
									className={`px-3 py-2 ${c.align === 'right' ? 'text-right' : 'text-left'}`}
								>
									{c.header}
								</th>
							))}
						</tr>
					</thead>
					<tbody>
						{shown.map((row) => (
							<tr
								key={rowKey(row)}
								className="border-t border-hairline align-top"
								{...rowProps?.(row)}
							>
								{columns.map((c) => (
									<td
										key={c.key}
										className={`px-3 py-1.5 ${c.align === 'right' ? 'text-right' : ''} ${c.numeric === false ? '' : 'num whitespace-nowrap'} ${c.tone?.(row) ?? ''}`}
									>
										{c.cell(row)}
									</td>
								))}
							</tr>
						))}
					</tbody>
				</table>
			</ScrollRegion>
			{shown.length < rows.length && (
				<button
					type="button"
					onClick={() => setAll(true)}
					className="mt-1 text-sm font-semibold text-copper-dark underline"
				>
					Show all {rows.length} rows
				</button>
			)}
		</>
	);
}

/** Rows a results table shows before "show all". */
export const RESULT_ROWS_SHOWN = 100;

/** A unit beside a figure, lighter than the figure. */
export function Unit({ children }: { children: ReactNode }) {
	return <span className="text-xs font-light text-ink-soft">{children}</span>;
}
