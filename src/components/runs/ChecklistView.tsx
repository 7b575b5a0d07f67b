import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { format } from 'date-fns';
import { formatShortDistance } from '@/engine/browser';
import { ApiError } from '@/lib/client/api-client';
import {
	currentUserId,
	enqueue,
	isOffline,
	type SignoffEntry,
	startOutbox,
	useOnLeave,
	useOthersOutbox,
	useOutbox,
} from '@/lib/client/outbox';
import {
	checklistKeys,
	checklistQueryOptions,
	useAddCheckItem,
	useSignOff,
} from '@/lib/client/queries/checklist';
import { withQueryClient } from '@/lib/client/query-client';
import { WAIVER_MIN_CHARS, type Checklist, type ChecklistItem } from '@/lib/schemas/checklist';
import { Button, Field, FormMessage } from '@/components/ui/Field';
import { OthersWaiting, OutboxList, SessionChangedNotice } from './OutboxList';
import { useLocalFormat } from '@/lib/client/local-time';

const ICON = {
	pass: { mark: '✓', word: 'passes', cls: 'text-teal' },
	fail: { mark: '✕', word: 'fails', cls: 'text-brick' },
	open: { mark: '○', word: 'to check', cls: 'text-ink-soft' },
	signed: { mark: '✓', word: 'signed off', cls: 'text-teal' },
	waived: { mark: '!', word: 'fails, waived', cls: 'text-amber-text' },
	reopened: { mark: '✕', word: 'fails, worse than waived', cls: 'text-brick' },
} as const;

function iconOf(item: ChecklistItem) {
	if (item.status === 'fail' && item.signoff?.waived)
		return item.signoff.reopened ? ICON.reopened : ICON.waived;
	if (item.kind === 'manual' && item.signoff) return ICON.signed;
	return ICON[item.status];
}

/**
 * The pre-event checklist: computed items with their reasons, manual items, sign-offs and waivers;
 * prints as an inspection sheet with the team, vehicle, class, event, revision and signature lines.
 */
export const ChecklistView = withQueryClient(function ChecklistView({
	teamId,
	initial,
	canSign,
	canWaive,
}: {
	teamId: string;
	initial: Checklist;
	canSign: boolean;
	canWaive: boolean;
}) {
	const qc = useQueryClient();
	const fmtTime = useLocalFormat();
	const when = (iso: string) => fmtTime(iso, 'd MMM yyyy HH:mm');
	const key = checklistKeys.sheet(initial.eventId, initial.vehicleId);
	const list =
		useQuery({
			...checklistQueryOptions(teamId, initial.eventId, initial.vehicleId),
			initialData: initial,
		}).data ?? initial;
	const setList = (l: Checklist) => qc.setQueryData(key, l);
	const others = useOthersOutbox();
	const pending = useOutbox().filter(
		(e): e is SignoffEntry =>
			e.kind === 'signoff' && e.eventId === list.eventId && e.vehicleId === list.vehicleId,
	);
	const pendingFor = (itemKey: string) => pending.find((e) => e.body.itemKey === itemKey);
	useOnLeave(
		pending.map((e) => e.id),
		() => void qc.invalidateQueries({ queryKey: key }),
	);
	// Sends what waits on this device; useOnLeave above fetches the sheet again as entries go out.
	useEffect(() => startOutbox(), []);
	const signOff = useSignOff(teamId, initial.eventId);
	const addItem = useAddCheckItem(teamId);
	const [error, setError] = useState<string | null>(null);
	const [newItem, setNewItem] = useState('');
	const [waiving, setWaiving] = useState<string | null>(null);
	const [reason, setReason] = useState('');
	const [reasonError, setReasonError] = useState<string | undefined>();

	async function sign(item: ChecklistItem, signed: boolean, note = '') {
		setError(null);
		const body = {
			vehicleId: list.vehicleId,
			itemKey: item.key,
			signed,
			note,
			seen: { revisionId: list.revision?.id ?? null, status: item.status },
		};
		try {
			try {
				setList(await signOff.mutateAsync(body));
			} catch (e) {
				const userId = currentUserId();
				if (!isOffline(e) || !userId) throw e;
				// No connection: kept on this device with what the member saw, sent when it returns.
				await enqueue({
					kind: 'signoff',
					id: crypto.randomUUID(),
					teamId,
					eventId: list.eventId,
					vehicleId: list.vehicleId,
					userId,
					createdAt: new Date().toISOString(),
					state: 'waiting',
					label: item.label,
					body,
				});
			}
			setWaiving(null);
			setReason('');
			setReasonError(undefined);
		} catch (e) {
			if (e instanceof ApiError && e.code === 'conflict' && e.body.current)
				setList(e.body.current as Checklist);
			if (e instanceof ApiError && e.byField().note) setReasonError(e.byField().note);
			else setError(e instanceof ApiError ? e.message : 'Could not reach the server');
		}
	}

	const outstanding = list.items.filter((i) => i.outstanding).length;
	const waived = list.items.filter(
		(i) => i.status === 'fail' && i.signoff?.waived && !i.signoff.reopened,
	).length;
	const rev = list.revision;
	return (
		<div className="flex flex-col gap-4">
			<dl className="grid grid-cols-2 gap-x-6 gap-y-1 rounded-md border border-hairline bg-card p-3 text-sm sm:grid-cols-4 print:grid-cols-4 print:border-ink">
				{(
					[
						['Team', list.teamName],
						['Vehicle', list.vehicleName],
						['Class', list.vehicleClass || '—'],
						['Event', `${list.eventName}${list.eventPlace ? `, ${list.eventPlace}` : ''}`],
						['Date', format(new Date(`${list.startsOn}T12:00:00`), 'd MMM yyyy')],
						[
							'Revision in force',
							rev ? `r${rev.number} (${fmtTime(rev.savedAt, 'd MMM yyyy')})` : 'none',
						],
						['Units', list.units === 'imperial' ? 'feet, inches, AWG' : 'metres, centimetres, mm²'],
					] as const
				).map(([k, v]) => (
					<div key={k} className="min-w-0">
						<dt className="text-xs text-ink-soft">{k}</dt>
						<dd className="font-semibold break-words">{v}</dd>
					</div>
				))}
			</dl>
			<p
				className={`rounded-md border p-3 text-sm ${outstanding ? 'border-brick/40 bg-brick-tint/50' : 'border-teal/40 bg-teal-tint/60'}`}
				role="status"
				data-banner={outstanding ? 'open' : 'clear'}
			>
				{outstanding
					? `⚠ ${outstanding} item${outstanding === 1 ? '' : 's'} still open: a failing item needs a fix or a captain's waiver with a reason; a manual item needs a sign-off.`
					: `✓ Every item passes${waived ? `, or is waived with a reason (${waived} waived)` : ''}${list.items.some((i) => i.kind === 'manual') ? ' or is signed off' : ''}.`}{' '}
				Battery fuses within {formatShortDistance(list.fuseDistanceM, list.units)} (common practice,
				no published source).
			</p>
			<SessionChangedNotice />
			<OutboxList entries={pending} title="Sign-offs waiting to be sent" />
			<OthersWaiting
				entries={others.filter(
					(e) =>
						e.kind === 'signoff' && e.eventId === list.eventId && e.vehicleId === list.vehicleId,
				)}
			/>
			<ol className="flex flex-col divide-y divide-hairline rounded-md border border-hairline bg-card">
				{list.items.map((item) => {
					const icon = iconOf(item);
					const needsWaiver = item.kind === 'computed' && item.status === 'fail';
					return (
						<li
							key={item.key}
							className="flex flex-wrap items-start gap-3 px-4 py-3 break-inside-avoid print:py-1.5 print:text-sm"
							data-item={item.key}
						>
							<span className={`text-lg font-bold ${icon.cls}`} aria-hidden="true">
								{icon.mark}
							</span>
							<div className="min-w-0 flex-1 basis-64">
								<p className="font-semibold break-words">
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
								{item.signoff &&
									(item.signoff.waived ? (
										<>
											<p className="mt-1 text-sm text-amber-text" data-waiver>
												Waived by {item.signoff.by ?? 'someone'}, {when(item.signoff.at)}
												{item.signoff.revisionNumber ? ` on r${item.signoff.revisionNumber}` : ''}.
												Reason: {item.signoff.note}
											</p>
											{item.signoff.reopened && (
												<p className="mt-1 text-sm font-semibold text-brick" data-reopened>
													✕ {item.signoff.reopened}: open again until fixed or waived anew.
												</p>
											)}
										</>
									) : (
										<p
											className={`mt-1 text-sm ${item.outstanding ? 'text-ink-soft' : 'text-teal'}`}
										>
											Signed off by {item.signoff.by ?? 'someone'}, {when(item.signoff.at)}
											{item.signoff.note && `: ${item.signoff.note}`}
											{item.outstanding && ' — before it failed; it needs a waiver now.'}
										</p>
									))}
								{pendingFor(item.key) && (
									<p className="mt-1 text-sm font-semibold text-amber-text" data-pending>
										{pendingFor(item.key)!.body.signed
											? 'Signed off on this device, not yet sent'
											: 'Sign-off withdrawn on this device, not yet sent'}
									</p>
								)}
								{waiving === item.key && (
									<form
										className="mt-2 flex flex-wrap items-end gap-2 print:hidden"
										onSubmit={(e) => {
											e.preventDefault();
											if (reason.trim().length < WAIVER_MIN_CHARS)
												setReasonError(
													`Write the reason for the waiver (at least ${WAIVER_MIN_CHARS} characters)`,
												);
											else void sign(item, true, reason);
										}}
									>
										<Field
											label="Why the team accepts this failing item"
											value={reason}
											onChange={(e) => setReason(e.target.value)}
											error={reasonError}
											hint={`Kept on the sheet with your name; at least ${WAIVER_MIN_CHARS} characters.`}
											className="min-w-0 flex-1 basis-64"
											autoFocus
										/>
										<Button type="submit" busy={signOff.isPending}>
											Waive with this reason
										</Button>
										<Button type="button" variant="secondary" onClick={() => setWaiving(null)}>
											Cancel
										</Button>
									</form>
								)}
							</div>
							{canSign && waiving !== item.key && !pendingFor(item.key) && (
								<div className="print:hidden">
									{item.signoff &&
									(!needsWaiver || (item.signoff.waived && !item.signoff.reopened)) ? (
										(!item.signoff.waived || canWaive) && (
											<Button
												type="button"
												variant="secondary"
												className="px-2 py-1 text-xs"
												onClick={() => void sign(item, false)}
											>
												{item.signoff.waived ? 'Withdraw the waiver' : 'Withdraw sign-off'}
											</Button>
										)
									) : needsWaiver ? (
										canWaive ? (
											<Button
												type="button"
												variant="secondary"
												className="px-2 py-1 text-xs"
												onClick={() => {
													setWaiving(item.key);
													setReason('');
													setReasonError(undefined);
												}}
											>
												Waive…
											</Button>
										) : (
											<span className="text-xs text-ink-soft">
												Needs a fix or a captain’s waiver
											</span>
										)
									) : (
										<Button
											type="button"
											variant="secondary"
											className="px-2 py-1 text-xs"
											onClick={() => void sign(item, true)}
										>
											Sign off
										</Button>
									)}
								</div>
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
			{/* Printed: kept with the last item, never alone on a page of its own. */}
			<div
				className="hidden grid-cols-3 gap-6 pt-6 text-sm print:grid print:break-before-avoid print:break-inside-avoid print:pt-3"
				aria-hidden="true"
			>
				{['Inspector’s name', 'Inspector’s signature', 'Date and time'].map((l) => (
					<div key={l}>
						<div className="h-8 border-b border-ink" />
						<p className="mt-1 text-xs">{l}</p>
					</div>
				))}
			</div>
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
						className="min-w-0 flex-1 basis-64"
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
