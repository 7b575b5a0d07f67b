import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { formatDistanceToNow } from 'date-fns';
import { useState } from 'react';
import { newInvitationSchema, teamNameSchema } from '@/lib/schemas/account';
import { ApiError } from '@/lib/client/api-client';
import { fieldErrors } from '@/lib/client/form-errors';
import { getQueryClient } from '@/lib/client/query-client';
import { invitationsQueryOptions, type MemberDto, membersQueryOptions, type Role, useDeleteTeam, useInvitationAction, useInvite, useMemberAction, useUpdateTeam } from '@/lib/client/queries/teams';
import { Button, Field, FormMessage } from '@/components/ui/Field';

export interface TeamSettingsProps {
	teamId: string;
	teamName: string;
	myRole: Role;
	myUserId: string;
	initialMembers: MemberDto[];
	reminderDays: number;
	currency: string;
}

const ROLES: Role[] = ['captain', 'member', 'viewer'];
const ROLE_HELP: Record<Role, string> = {
	captain: 'everything, including members and team settings',
	member: 'edits vehicles, builds, events and results',
	viewer: 'reads everything, changes nothing',
};

export function TeamSettings(props: TeamSettingsProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<TeamSettingsView {...props} />
		</QueryClientProvider>
	);
}

export function TeamSettingsView({ teamId, teamName, myRole, myUserId, initialMembers, reminderDays, currency }: TeamSettingsProps) {
	const captain = myRole === 'captain';
	return (
		<div className="flex flex-col gap-10">
			<MembersSection teamId={teamId} captain={captain} myUserId={myUserId} initialMembers={initialMembers} />
			{captain && <InviteSection teamId={teamId} />}
			{captain && <PendingSection teamId={teamId} />}
			{captain && <TeamNameSection teamId={teamId} teamName={teamName} />}
			{captain && <ReminderSection teamId={teamId} initialDays={reminderDays} />}
			{captain && <CurrencySection teamId={teamId} initial={currency} />}
			<LeaveOrDeleteSection teamId={teamId} teamName={teamName} captain={captain} myUserId={myUserId} />
		</div>
	);
}

function ErrorNote({ error }: { error: unknown }) {
	if (!error) return null;
	return <FormMessage tone="error">{error instanceof ApiError ? error.message : 'Something went wrong. Try again.'}</FormMessage>;
}

function MembersSection({ teamId, captain, myUserId, initialMembers }: { teamId: string; captain: boolean; myUserId: string; initialMembers: MemberDto[] }) {
	const members = useQuery({ ...membersQueryOptions(teamId), initialData: initialMembers });
	const action = useMemberAction(teamId);
	return (
		<section aria-labelledby="members-heading">
			<h2 id="members-heading" className="text-xl font-bold">
				Members
			</h2>
			<div className="mt-3 overflow-x-auto rounded-md border border-hairline bg-card">
				<table className="w-full text-left text-sm">
					<thead className="border-b border-hairline bg-paper text-xs uppercase tracking-wide text-ink-soft">
						<tr>
							<th scope="col" className="px-4 py-2">Name</th>
							<th scope="col" className="px-4 py-2">E-mail</th>
							<th scope="col" className="px-4 py-2">Role</th>
							<th scope="col" className="px-4 py-2">Joined</th>
							{captain && <th scope="col" className="px-4 py-2"><span className="sr-only">Actions</span></th>}
						</tr>
					</thead>
					<tbody>
						{members.data.map((m) => (
							<tr key={m.userId} className="border-b border-hairline last:border-0">
								<td className="px-4 py-2 font-semibold">
									{m.name ?? '—'} {m.userId === myUserId && <span className="ml-1 rounded bg-paper px-1.5 text-xs text-ink-soft">you</span>}
								</td>
								<td className="px-4 py-2">{m.email}</td>
								<td className="px-4 py-2">
									{captain ? (
										<select
											aria-label={`Role of ${m.email}`}
											value={m.role}
											disabled={action.isPending}
											onChange={(e) => action.mutate({ userId: m.userId, role: e.target.value as Role })}
											className="rounded-md border border-hairline bg-card px-2 py-1"
										>
											{ROLES.map((r) => (
												<option key={r} value={r}>
													{r}
												</option>
											))}
										</select>
									) : (
										<span className="capitalize">{m.role}</span>
									)}
								</td>
								<td className="px-4 py-2 text-ink-soft">{formatDistanceToNow(new Date(m.joinedAt), { addSuffix: true })}</td>
								{captain && (
									<td className="px-4 py-2 text-right">
										{m.userId !== myUserId && (
											<Button
												variant="secondary"
												className="px-2 py-1 text-xs"
												onClick={() => {
													if (window.confirm(`Remove ${m.email} from the team?`)) action.mutate({ userId: m.userId, role: null });
												}}
											>
												Remove
											</Button>
										)}
									</td>
								)}
							</tr>
						))}
					</tbody>
				</table>
			</div>
			<div className="mt-2">
				<ErrorNote error={action.error} />
			</div>
			<p className="mt-2 text-sm text-ink-soft">
				Captain: {ROLE_HELP.captain}. Member: {ROLE_HELP.member}. Viewer: {ROLE_HELP.viewer}.
			</p>
		</section>
	);
}

function InviteSection({ teamId }: { teamId: string }) {
	const [email, setEmail] = useState('');
	const [role, setRole] = useState<Role>('member');
	const [errors, setErrors] = useState<Record<string, string>>({});
	const invite = useInvite(teamId);
	const [sentTo, setSentTo] = useState<string | null>(null);

	function submit(event: React.FormEvent) {
		event.preventDefault();
		setSentTo(null);
		const parsed = newInvitationSchema.safeParse({ email, role });
		if (!parsed.success) return setErrors(fieldErrors(parsed.error));
		setErrors({});
		invite.mutate(parsed.data, {
			onSuccess: (inv) => {
				setSentTo(inv.email);
				setEmail('');
			},
			onError: (e) => e instanceof ApiError && setErrors(e.byField()),
		});
	}

	return (
		<section aria-labelledby="invite-heading">
			<h2 id="invite-heading" className="text-xl font-bold">
				Invite someone
			</h2>
			<form onSubmit={submit} noValidate className="mt-3 flex flex-wrap items-end gap-3 rounded-md border border-hairline bg-card p-4" aria-label="Invite by e-mail">
				<Field label="E-mail" type="email" name="invite-email" value={email} onChange={(e) => setEmail(e.target.value)} error={errors.email} className="min-w-64 flex-1" />
				<div className="flex flex-col gap-1">
					<label htmlFor="invite-role" className="text-sm font-semibold">
						Role
					</label>
					<select id="invite-role" value={role} onChange={(e) => setRole(e.target.value as Role)} className="rounded-md border border-hairline bg-card px-3 py-2">
						{ROLES.map((r) => (
							<option key={r} value={r}>
								{r}
							</option>
						))}
					</select>
				</div>
				<Button type="submit" busy={invite.isPending}>
					Send invitation
				</Button>
			</form>
			<div className="mt-2 flex flex-col gap-2">
				{sentTo && <FormMessage tone="ok">Invitation sent to {sentTo}. The link works once, for 7 days.</FormMessage>}
				{invite.error && !Object.keys(errors).length && <ErrorNote error={invite.error} />}
			</div>
		</section>
	);
}

function PendingSection({ teamId }: { teamId: string }) {
	const pending = useQuery(invitationsQueryOptions(teamId));
	const action = useInvitationAction(teamId);
	return (
		<section aria-labelledby="pending-heading">
			<h2 id="pending-heading" className="text-xl font-bold">
				Pending invitations
			</h2>
			{pending.isPending && <p className="mt-3 text-sm text-ink-soft" role="status">Loading invitations…</p>}
			{pending.isError && <div className="mt-3"><ErrorNote error={pending.error} /></div>}
			{pending.data && pending.data.length === 0 && <p className="mt-3 text-sm text-ink-soft">No invitations waiting for an answer.</p>}
			{pending.data && pending.data.length > 0 && (
				<ul className="mt-3 divide-y divide-hairline rounded-md border border-hairline bg-card">
					{pending.data.map((inv) => (
						<li key={inv.id} className="flex flex-wrap items-center gap-3 px-4 py-3 text-sm">
							<span className="font-semibold">{inv.email}</span>
							<span className="rounded bg-paper px-2 py-0.5 capitalize">{inv.role}</span>
							<span className={inv.expired ? 'text-amber-text' : 'text-ink-soft'}>
								{inv.expired ? '⏱ expired' : `expires ${formatDistanceToNow(new Date(inv.expiresAt), { addSuffix: true })}`}
							</span>
							<span className="flex-1" />
							<Button variant="secondary" className="px-2 py-1 text-xs" busy={action.isPending && action.variables?.id === inv.id && action.variables.action === 'resend'} onClick={() => action.mutate({ id: inv.id, action: 'resend' })}>
								Send again
							</Button>
							<Button variant="secondary" className="px-2 py-1 text-xs" onClick={() => action.mutate({ id: inv.id, action: 'revoke' })}>
								Withdraw
							</Button>
						</li>
					))}
				</ul>
			)}
			<div className="mt-2">
				<ErrorNote error={action.error} />
			</div>
		</section>
	);
}

function TeamNameSection({ teamId, teamName }: { teamId: string; teamName: string }) {
	const [name, setName] = useState(teamName);
	const [error, setError] = useState<string | undefined>();
	const update = useUpdateTeam(teamId);
	function submit(event: React.FormEvent) {
		event.preventDefault();
		const parsed = teamNameSchema.safeParse(name);
		if (!parsed.success) return setError(parsed.error.issues[0]!.message);
		setError(undefined);
		update.mutate({ name: parsed.data }, { onError: (e) => setError(e instanceof ApiError ? e.message : 'Could not save') });
	}
	return (
		<section aria-labelledby="name-heading">
			<h2 id="name-heading" className="text-xl font-bold">
				Team name
			</h2>
			<form onSubmit={submit} noValidate className="mt-3 flex flex-wrap items-end gap-3">
				<Field label="Name" value={name} onChange={(e) => { setName(e.target.value); update.reset(); }} error={error} className="min-w-64" />
				<Button type="submit" variant="secondary" busy={update.isPending}>
					Rename
				</Button>
				{update.isSuccess && <span role="status" className="text-sm text-teal">✓ Saved</span>}
			</form>
		</section>
	);
}

function LeaveOrDeleteSection({ teamId, teamName, captain, myUserId }: { teamId: string; teamName: string; captain: boolean; myUserId: string }) {
	const [confirmName, setConfirmName] = useState('');
	const leave = useMemberAction(teamId);
	const remove = useDeleteTeam(teamId);
	const toTeams = { onSuccess: () => window.location.assign('/teams') };
	const busy = leave.isPending || remove.isPending;
	const error = leave.error ?? remove.error;
	return (
		<section aria-labelledby="danger-heading" className="rounded-md border border-brick/40 p-4">
			<h2 id="danger-heading" className="text-xl font-bold text-brick">
				Leave or delete
			</h2>
			<div className="mt-3 flex flex-col gap-4">
				<div className="flex flex-wrap items-center gap-3">
					<Button variant="secondary" busy={busy} onClick={() => window.confirm(`Leave ${teamName}?`) && leave.mutate({ userId: myUserId, role: null }, toTeams)}>
						Leave the team
					</Button>
					<span className="text-sm text-ink-soft">The last captain cannot leave; make someone else captain first.</span>
				</div>
				{captain && (
					<form
						className="flex flex-wrap items-end gap-3"
						onSubmit={(e) => {
							e.preventDefault();
							remove.mutate(confirmName, toTeams);
						}}
					>
						<Field label={`Type “${teamName}” to delete the team and all its data`} value={confirmName} onChange={(e) => setConfirmName(e.target.value)} className="min-w-72" />
						<Button type="submit" variant="danger" busy={busy} disabled={confirmName.trim() !== teamName}>
							Delete the team
						</Button>
					</form>
				)}
				<ErrorNote error={error} />
			</div>
		</section>
	);
}

function CurrencySection({ teamId, initial }: { teamId: string; initial: string }) {
	return (
		<TeamSettingForm
			teamId={teamId}
			id="currency"
			title="Plan prices"
			description="The currency plan parts are priced in. Changing it relabels the prices; it does not convert them."
			label="Currency code"
			hint="Three letters, e.g. USD, EUR, GBP"
			initial={initial}
			maxLength={3}
			field="currency"
			toBody={(v) => ({ currency: v })}
			saved={(v) => `Plan prices are in ${v.trim().toUpperCase()}.`}
		/>
	);
}

function ReminderSection({ teamId, initialDays }: { teamId: string; initialDays: number }) {
	return (
		<TeamSettingForm
			teamId={teamId}
			id="reminder"
			title="Event reminders"
			label="Days before an event"
			inputMode="numeric"
			initial={String(initialDays)}
			field="reminderDays"
			toBody={(v) => ({ reminderDays: Number(v) })}
			saved={(v) => `Members get a reminder ${v} days before each event.`}
		/>
	);
}

/** One team setting: a field, a save button, the server's verdict beside it. */
function TeamSettingForm(p: {
	teamId: string;
	id: string;
	title: string;
	description?: string;
	label: string;
	hint?: string;
	initial: string;
	maxLength?: number;
	inputMode?: 'numeric';
	field: string;
	toBody: (value: string) => { currency?: string; reminderDays?: number };
	saved: (value: string) => string;
}) {
	const [value, setValue] = useState(p.initial);
	const update = useUpdateTeam(p.teamId);
	const [note, setNote] = useState<string | null>(null);
	const error = update.error instanceof ApiError ? (update.error.byField()[p.field] ?? update.error.message) : update.error ? 'Could not save' : undefined;
	return (
		<section aria-labelledby={`${p.id}-heading`}>
			<h2 id={`${p.id}-heading`} className="text-xl font-bold">{p.title}</h2>
			{p.description && <p className="text-sm text-ink-soft">{p.description}</p>}
			<form
				noValidate
				className="mt-3 flex flex-wrap items-end gap-3"
				onSubmit={(e) => {
					e.preventDefault();
					setNote(null);
					update.mutate(p.toBody(value), { onSuccess: () => setNote(p.saved(value)) });
				}}
			>
				<Field label={p.label} inputMode={p.inputMode} maxLength={p.maxLength} value={value} onChange={(e) => setValue(e.target.value)} error={error} hint={p.hint} className="w-48" />
				<Button type="submit" variant="secondary" busy={update.isPending}>Save</Button>
				{note && <span role="status" className="text-sm text-teal">✓ {note}</span>}
			</form>
		</section>
	);
}
