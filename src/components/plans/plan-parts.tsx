import { useMemo } from 'react';
import type { PlanDto } from '@/lib/client/queries/plans';
import { minorToText } from '@/lib/money';
import type { ShelfItemDto } from '@/lib/shelf-kinds';
import { formatMoney } from '@/lib/format';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

/** A parts line as edited: numbers kept as typed so a half-typed price is not lost. */
export interface PartDraft {
	item: string;
	quantity: string;
	unitPrice: string;
	link: string;
}

export const toDraft = (p: PlanDto['parts'][number]): PartDraft => ({
	item: p.item,
	quantity: String(p.quantity),
	unitPrice: p.unitPrice.toFixed(2),
	link: p.link,
});
export const fromDraft = (p: PartDraft) => ({
	item: p.item,
	quantity: Number(p.quantity),
	unitPrice: Number(p.unitPrice),
	link: p.link,
});

/**
 * The shelf as a plan's add form reaches it: a part started from an entry adds a line to the parts
 * to buy at the shelf's price (a cable by the metre, its length rounded up).
 */
export function useShelfPicks(
	teamId: string,
	setParts: (update: (parts: PartDraft[]) => PartDraft[]) => void,
) {
	return useMemo(
		() => ({
			teamId,
			onPick: (entry: ShelfItemDto, part: Record<string, unknown>) =>
				setParts((ps) => [
					...ps,
					{
						item: entry.label,
						quantity: String(
							entry.kind === 'cables' ? Math.max(1, Math.ceil(Number(part.lengthM) || 1)) : 1,
						),
						unitPrice: entry.priceMinor === null ? '0.00' : minorToText(entry.priceMinor),
						link: entry.link,
					},
				]),
		}),
		[teamId, setParts],
	);
}

/** The plan's parts to buy, each field editable in place, with line totals and the plan's total. */
export function PlanPartsTable({
	parts,
	errors,
	canEdit,
	currency,
	total,
	onChange,
	onRemove,
	onAdd,
}: {
	parts: PartDraft[];
	errors: Record<string, string>;
	canEdit: boolean;
	currency: string;
	total: number;
	onChange: (index: number, patch: Partial<PartDraft>) => void;
	onRemove: (index: number) => void;
	onAdd: () => void;
}) {
	return (
		<ScrollRegion label="Parts to buy" className="mt-3 rounded-md border border-hairline bg-card">
			<table className="w-full text-sm">
				<caption className="sr-only">Parts list</caption>
				<thead className="bg-paper text-xs text-ink-soft">
					<tr>
						<th className="px-3 py-2 text-left">Item</th>
						<th className="w-24 px-3 py-2 text-right">Qty</th>
						<th className="w-32 px-3 py-2 text-right">Unit price</th>
						<th className="px-3 py-2 text-left">Link or reference</th>
						<th className="w-32 px-3 py-2 text-right">Line total</th>
						{canEdit && (
							<th className="w-10 px-3 py-2">
								<span className="sr-only">Remove</span>
							</th>
						)}
					</tr>
				</thead>
				<tbody>
					{parts.length === 0 && (
						<tr>
							<td colSpan={6} className="px-3 py-3 text-ink-soft">
								No parts listed yet.
							</td>
						</tr>
					)}
					{parts.map((p, i) => (
						<tr key={i} className="border-t border-hairline align-top">
							<PartCell
								label={`Item ${i + 1}`}
								value={p.item}
								error={errors[`parts.${i}.item`]}
								readOnly={!canEdit}
								onChange={(v) => onChange(i, { item: v })}
							/>
							<PartCell
								label={`Quantity ${i + 1}`}
								value={p.quantity}
								error={errors[`parts.${i}.quantity`]}
								readOnly={!canEdit}
								onChange={(v) => onChange(i, { quantity: v })}
								numeric
							/>
							<PartCell
								label={`Unit price ${i + 1}`}
								value={p.unitPrice}
								error={errors[`parts.${i}.unitPrice`]}
								readOnly={!canEdit}
								onChange={(v) => onChange(i, { unitPrice: v })}
								numeric
							/>
							<PartCell
								label={`Link ${i + 1}`}
								value={p.link}
								error={errors[`parts.${i}.link`]}
								readOnly={!canEdit}
								onChange={(v) => onChange(i, { link: v })}
							/>
							<td className="num px-3 py-2 text-right">
								{Number.isFinite(Number(p.quantity) * Number(p.unitPrice))
									? formatMoney(
											(Math.round(Number(p.unitPrice) * 100) * Number(p.quantity)) / 100,
											currency,
										)
									: '—'}
							</td>
							{canEdit && (
								<td className="px-2 py-1.5">
									<button
										type="button"
										onClick={() => onRemove(i)}
										className="rounded px-2 py-1 text-ink-soft hover:bg-brick-tint hover:text-brick"
										aria-label={`Remove part ${i + 1}`}
									>
										✕
									</button>
								</td>
							)}
						</tr>
					))}
				</tbody>
				<tfoot>
					<tr className="border-t-2 border-hairline font-semibold">
						<td className="px-3 py-2" colSpan={4}>
							{canEdit && (
								<button
									type="button"
									onClick={onAdd}
									className="rounded-md border border-hairline bg-card px-2 py-0.5 text-sm font-normal hover:border-copper"
								>
									+ Add a part
								</button>
							)}
						</td>
						<td className="num px-3 py-2 text-right" data-testid="parts-total">
							{formatMoney(total, currency)}
						</td>
						{canEdit && <td />}
					</tr>
				</tfoot>
			</table>
		</ScrollRegion>
	);
}

function PartCell({
	label,
	value,
	error,
	readOnly,
	onChange,
	numeric,
}: {
	label: string;
	value: string;
	error?: string;
	readOnly: boolean;
	onChange: (v: string) => void;
	numeric?: boolean;
}) {
	return (
		<td className="px-2 py-1.5">
			<input
				aria-label={label}
				value={value}
				readOnly={readOnly}
				inputMode={numeric ? 'decimal' : undefined}
				onChange={(e) => onChange(e.target.value)}
				aria-invalid={error ? true : undefined}
				className={`w-full rounded border bg-card px-2 py-1 ${numeric ? 'num text-right' : ''} ${error ? 'border-brick' : 'border-hairline'}`}
			/>
			{error && (
				<p role="alert" className="mt-0.5 text-xs text-brick">
					{error}
				</p>
			)}
		</td>
	);
}
