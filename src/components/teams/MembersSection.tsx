import { useQuery } from '@tanstack/react-query';
import {
	type MemberDto,
	membersQueryOptions,
	type Role,
	useMemberAction,
} from '@/lib/client/queries/teams';
import { Button } from '@/components/ui/Field';
import { ErrorNote } from './ErrorNote';
import { RelativeTime } from '@/components/ui/RelativeTime';
import { ScrollRegion } from '@/components/ui/ScrollRegion';

export const ROLES: Role[] = ['captain', 'member', 'viewer'];
export const ROLE_HELP: Record<Role, string> = {
	captain: 'everything, including members and team settings',
	member: 'edits vehicles, builds, events and results',
	viewer: 'reads everything, changes nothing',
};

export function MembersSection({
	teamId,
	captain,
	myUserId,
	initialMembers,
}: {
	teamId: string;
	captain: boolean;
	myUserId: string;
	initialMembers: MemberDto[];
}) {
	const members = useQuery({ ...membersQueryOptions(teamId), initialData: initialMembers });
	const action = useMemberAction(teamId);
	return (
		<section aria-labelledby="members-heading">
			<h2 id="members-heading" className="text-xl font-bold">
				Members
			</h2>
			<ScrollRegion label="Members" className="mt-3 rounded-md border border-hairline bg-card">
				<table className="w-full text-left text-sm">
					<thead className="border-b border-hairline bg-paper text-xs uppercase tracking-wide text-ink-soft">
						<tr>
							<th scope="col" className="px-4 py-2">
								Name
							</th>
							<th scope="col" className="px-4 py-2 max-sm:hidden">
								E-mail
							</th>
							<th scope="col" className="px-4 py-2">
								Role
							</th>
							<th scope="col" className="px-4 py-2 max-sm:hidden">
								Joined
							</th>
							{captain && (
								<th scope="col" className="px-4 py-2">
									<span className="sr-only">Actions</span>
								</th>
							)}
						</tr>
					</thead>
					<tbody>
						{members.data.map((m) => (
							<tr key={m.userId} className="border-b border-hairline last:border-0">
								<td className="px-4 py-2 font-semibold break-words max-sm:px-2">
									{m.name ?? '—'}{' '}
									{m.userId === myUserId && (
										<span className="ml-1 rounded bg-paper px-1.5 text-xs text-ink-soft">you</span>
									)}
									{/* On a phone the e-mail sits under the name, so role and Remove stay in view. */}
									<span className="block text-xs font-normal break-all text-ink-soft sm:hidden">
										{m.email}
									</span>
								</td>
								<td className="px-4 py-2 max-sm:hidden">{m.email}</td>
								<td className="px-4 py-2">
									{captain ? (
										<select
											aria-label={`Role of ${m.email}`}
											value={m.role}
											disabled={action.isPending}
											onChange={(e) =>
												action.mutate({ userId: m.userId, role: e.target.value as Role })
											}
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
								<td className="px-4 py-2 text-ink-soft max-sm:hidden">
									<RelativeTime at={m.joinedAt} />
								</td>
								{captain && (
									<td className="px-4 py-2 text-right">
										{m.userId !== myUserId && (
											<Button
												variant="secondary"
												className="px-2 py-1 text-xs"
												onClick={() => {
													if (window.confirm(`Remove ${m.email} from the team?`))
														action.mutate({ userId: m.userId, role: null });
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
			</ScrollRegion>
			<div className="mt-2">
				<ErrorNote error={action.error} />
			</div>
			<p className="mt-2 text-sm text-ink-soft">
				Captain: {ROLE_HELP.captain}. Member: {ROLE_HELP.member}. Viewer: {ROLE_HELP.viewer}.
			</p>
		</section>
	);
}
