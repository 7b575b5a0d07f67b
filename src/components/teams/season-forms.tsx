import { useRef, useState } from 'react';
import { Button, Field, FormMessage } from '@/components/ui/Field';
import { ApiError } from '@/lib/client/api-client';
import { useAddPurchase, useCreateSeason } from '@/lib/client/queries/seasons';
import { minorToText, parseMoney } from '@/lib/money';
import type { SeasonDetail } from '@/lib/schemas/seasons';
import type { ShelfItemDto } from '@/lib/shelf-kinds';

/** A captain starts a season with its dates and budget (typed money read exactly). */
export function NewSeasonForm({
	teamId,
	today,
	onCreated,
}: {
	teamId: string;
	today: string;
	onCreated: (id: string) => void;
}) {
	const create = useCreateSeason(teamId);
	const [name, setName] = useState(`${today.slice(0, 4)} season`);
	const [startsOn, setStartsOn] = useState(today);
	const [endsOn, setEndsOn] = useState(`${today.slice(0, 4)}-12-31`);
	const [budget, setBudget] = useState('');
	const [errors, setErrors] = useState<Record<string, string>>({});
	const box = useRef<HTMLDetailsElement>(null);
	return (
		<details ref={box} className="rounded-md border border-hairline bg-card p-3">
			<summary className="cursor-pointer font-semibold">Start a season with its budget</summary>
			<form
				aria-label="Start a season"
				className="mt-3 grid grid-cols-1 gap-3 sm:grid-cols-4"
				onSubmit={async (e) => {
					e.preventDefault();
					const budgetMinor = parseMoney(budget);
					if (budgetMinor === null)
						return setErrors({ budgetMinor: 'A budget is a number with at most two decimals' });
					try {
						const s = await create.mutateAsync({ name, startsOn, endsOn, budgetMinor });
						setErrors({});
						onCreated(s.id);
						if (box.current) box.current.open = false;
					} catch (error) {
						setErrors(
							error instanceof ApiError
								? { ...error.byField(), form: error.message }
								: { form: 'Could not reach the server.' },
						);
					}
				}}
			>
				<Field
					label="Name"
					value={name}
					onChange={(e) => setName(e.target.value)}
					error={errors.name}
				/>
				<Field
					label="From"
					type="date"
					value={startsOn}
					onChange={(e) => setStartsOn(e.target.value)}
					error={errors.startsOn}
				/>
				<Field
					label="To"
					type="date"
					value={endsOn}
					onChange={(e) => setEndsOn(e.target.value)}
					error={errors.endsOn}
				/>
				<Field
					label="Budget"
					inputMode="decimal"
					value={budget}
					onChange={(e) => setBudget(e.target.value)}
					error={errors.budgetMinor}
					placeholder="2500.00"
				/>
				<div className="sm:col-span-4">
					<Button type="submit" busy={create.isPending}>
						Start the season
					</Button>
					{errors.form && <FormMessage tone="error">{errors.form}</FormMessage>}
				</div>
			</form>
		</details>
	);
}

/** A member records what was bought (from the shelf, its price filled, or free text) and who paid. */
export function PurchaseForm({
	teamId,
	detail,
	today,
	shelf,
}: {
	teamId: string;
	detail: SeasonDetail;
	today: string;
	shelf: ShelfItemDto[];
}) {
	const add = useAddPurchase(teamId, detail.season.id);
	const [shelfItemId, setShelfItemId] = useState('');
	const [item, setItem] = useState('');
	const [boughtOn, setBoughtOn] = useState(
		today >= detail.season.startsOn && today <= detail.season.endsOn
			? today
			: detail.season.startsOn,
	);
	const [quantity, setQuantity] = useState('1');
	const [price, setPrice] = useState('');
	const [paidBy, setPaidBy] = useState(detail.payers[0]?.id ?? '');
	const [errors, setErrors] = useState<Record<string, string>>({});
	const [done, setDone] = useState<string | null>(null);
	return (
		<form
			aria-label="Record a purchase"
			className="mt-2 grid grid-cols-1 gap-3 rounded-md border border-hairline bg-card p-3 sm:grid-cols-3"
			onSubmit={async (e) => {
				e.preventDefault();
				const unitPriceMinor = parseMoney(price);
				const qty = /^\s*\d+\s*$/.test(quantity) ? Number(quantity) : NaN;
				const local: Record<string, string> = {};
				if (unitPriceMinor === null)
					local.unitPriceMinor = 'A price is a number with at most two decimals';
				if (Number.isNaN(qty)) local.quantity = 'Quantity is a whole number';
				if (Object.keys(local).length) return setErrors(local);
				try {
					await add.mutateAsync({
						boughtOn,
						shelfItemId: shelfItemId || null,
						item,
						quantity: qty,
						unitPriceMinor: unitPriceMinor!,
						paidBy,
					});
					setErrors({});
					setDone(`Recorded ${item}.`);
					setItem('');
					setPrice('');
					setQuantity('1');
					setShelfItemId('');
				} catch (error) {
					setDone(null);
					setErrors(
						error instanceof ApiError
							? { ...error.byField(), form: error.message }
							: { form: 'Could not reach the server.' },
					);
				}
			}}
		>
			{shelf.length > 0 && (
				<div className="flex min-w-0 flex-col gap-1 sm:col-span-3">
					<label htmlFor="purchase-shelf" className="text-sm font-semibold">
						From the shelf
					</label>
					<select
						id="purchase-shelf"
						value={shelfItemId}
						onChange={(e) => {
							setShelfItemId(e.target.value);
							const entry = shelf.find((x) => x.id === e.target.value);
							if (entry) {
								setItem(entry.label);
								if (entry.priceMinor !== null) setPrice(minorToText(entry.priceMinor));
							}
						}}
						className="min-w-0 rounded-md border border-hairline bg-card px-3 py-2"
					>
						<option value="">Something not on the shelf</option>
						{shelf.map((x) => (
							<option key={x.id} value={x.id}>
								{x.label}
								{x.priceMinor === null ? '' : ` · ${minorToText(x.priceMinor)}`}
							</option>
						))}
					</select>
				</div>
			)}
			<Field
				label="Item"
				value={item}
				onChange={(e) => setItem(e.target.value)}
				error={errors.item}
			/>
			<Field
				label="Date"
				type="date"
				value={boughtOn}
				onChange={(e) => setBoughtOn(e.target.value)}
				error={errors.boughtOn}
			/>
			<div className="flex min-w-0 flex-col gap-1">
				<label htmlFor="purchase-payer" className="text-sm font-semibold">
					Paid by
				</label>
				<select
					id="purchase-payer"
					value={paidBy}
					onChange={(e) => setPaidBy(e.target.value)}
					className="min-w-0 rounded-md border border-hairline bg-card px-3 py-2"
				>
					{detail.payers.map((p) => (
						<option key={p.id} value={p.id}>
							{p.name}
						</option>
					))}
				</select>
				{errors.paidBy && <FormMessage tone="error">{errors.paidBy}</FormMessage>}
			</div>
			<Field
				label="Quantity"
				inputMode="numeric"
				value={quantity}
				onChange={(e) => setQuantity(e.target.value)}
				error={errors.quantity}
			/>
			<Field
				label="Unit price"
				inputMode="decimal"
				value={price}
				onChange={(e) => setPrice(e.target.value)}
				error={errors.unitPriceMinor}
				placeholder="34.50"
			/>
			<div className="flex items-end gap-3">
				<Button type="submit" busy={add.isPending}>
					Record the purchase
				</Button>
			</div>
			{(errors.form || done) && (
				<div className="sm:col-span-3" role="status">
					{errors.form ? (
						<FormMessage tone="error">{errors.form}</FormMessage>
					) : (
						<span className="text-sm text-ink-soft">{done}</span>
					)}
				</div>
			)}
		</form>
	);
}
