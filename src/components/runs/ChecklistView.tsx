import { useState } from 'react';
import { format } from 'date-fns';
import { ApiError } from '@/lib/client/api-client';
import { useAddCheckItem, useSignOff } from '@/lib/client/queries/checklist';
import { withQueryClient } from '@/lib/client/query-client';
import type { Checklist } from '@/lib/schemas/checklist';
import { Button, Field, FormMessage } from '@/components/ui/Field';

const ICON = {
	pass: { mark: '✓', word: 'passes', cls: 'text-teal' },
	fail: { mark: '✕', word: 'fails', cls: 'text-brick' },
	open: { mark: '○', word: 'to check', cls: 'text-ink-soft' },
} as const;

/** The pre-event checklist: computed items with their reasons, manual items, sign-offs; prints cleanly. */
export const ChecklistView = withQueryClient(function ChecklistView({
	teamId,
	initial,
	canSign,
}: {
	teamId: string;
	initial: Checklist;
	canSign: boolean;
}) {
	const [list, setList] = useState(initial);
	const signOff = useSignOff(teamId, initial.eventId);
	const addItem = useAddCheckItem(teamId);
	const [error, setError] = useState<string | null>(null);
	const [newItem, setNewItem] = useState('');
	async function sign(itemKey: string, signed: boolean) {
		setError(null);
		try {
			setList(await signOff.mutateAsync({ vehicleId: list.vehicleId, itemKey, signed }));
		} catch (e) {
			setError(e instanceof ApiError ? e.message : 'Could not reach the server');
		}
	}
	const failing = list.items.filter((i) => i.status === 'fail' && !i.signoff).length;
	return (
		<div className="flex flex-col gap-4">
			<p
				className={`rounded-md border p-3 text-sm ${failing ? 'border-brick/40 bg-brick-tint/50' : 'border-teal/40 bg-teal-tint/60'}`}
				role="status"
			>
				{failing
					? `⚠ ${failing} computed item${failing === 1 ? '' : 's'} fail${failing === 1 ? 's' : ''} and ${failing === 1 ? 'is' : 'are'} not signed off.`
					: '✓ No failing computed item left unsigned.'}{' '}
				Revision {list.revision ? `r${list.revision.number}` : '—'}; battery fuses within{' '}
				{Math.round(list.fuseDistanceM * 100)} cm (common practice, no published source).
			</p>
			<ol className="flex flex-col divide-y divide-hairline rounded-md border border-hairline bg-card">
				{list.items.map((item) => {
					const icon = ICON[item.status];
					return (
						<li
							key={item.key}
							className="flex flex-wrap items-start gap-3 px-4 py-3 break-inside-avoid"
							data-item={item.key}
						>
							<span className={`text-lg font-bold ${icon.cls}`} aria-hidden="true">
								{icon.mark}
							</span>
							<div className="min-w-64 flex-1">
								<p className="font-semibold">
									{item.label}{' '}
									<span className={`text-xs font-normal ${icon.cls}`}>
										({item.kind === 'manual' ? 'manual, ' : ''}
										{icon.word})
									</span>
								</p>
								{item.reasons.length > 0 && (
									<ul className="mt-1 list-disc pl-5 text-sm text-brick">
										{item.reasons.map((r, i) => (
											<li key={i}>{r}</li>
										))}
									</ul>
								)}
								{item.signoff && (
									<p className="mt-1 text-sm text-teal">
										Signed off by {item.signoff.by ?? 'someone'},{' '}
										{format(new Date(item.signoff.at), 'd MMM yyyy HH:mm')}
										{item.signoff.note && `: ${item.signoff.note}`}
									</p>
								)}
							</div>
							{canSign && (
								<Button
									variant="secondary"
									className="px-2 py-1 text-xs print:hidden"
									onClick={() => void sign(item.key, !item.signoff)}
								>
									{item.signoff ? 'Withdraw sign-off' : 'Sign off'}
								</Button>
							)}
							<span
								className="hidden w-40 border-b border-ink print:inline-block"
								aria-hidden="true"
							>
								&nbsp;
							</span>
						</li>
					);
				})}
			</ol>
			{error && <FormMessage tone="error">{error}</FormMessage>}
			{canSign && (
				<form
					className="flex flex-wrap items-end gap-3 print:hidden"
					onSubmit={async (e) => {
						e.preventDefault();
						try {
							await addItem.mutateAsync(newItem);
							window.location.reload();
						} catch (err) {
							setError(
								err instanceof ApiError
									? (err.byField().label ?? err.message)
									: 'Could not reach the server',
							);
						}
					}}
				>
					<Field
						label="Add a manual item to every checklist of the team"
						value={newItem}
						onChange={(e) => setNewItem(e.target.value)}
						className="min-w-96"
					/>
					<Button type="submit" variant="secondary" busy={addItem.isPending}>
						Add the item
					</Button>
				</form>
			)}
			<p className="text-xs text-ink-soft">
				Sagwise computes these items from the build as entered; they are estimates, not an
				inspection. Event rules, the inspectors and local codes decide.
			</p>
		</div>
	);
});
