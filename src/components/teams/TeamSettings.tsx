import { QueryClientProvider } from '@tanstack/react-query';
import { getQueryClient } from '@/lib/client/query-client';
import type { MemberDto, Role } from '@/lib/client/queries/teams';
import { InviteSection } from './InviteSection';
import { LeaveOrDeleteSection } from './LeaveOrDeleteSection';
import { MembersSection } from './MembersSection';
import { PendingSection } from './PendingSection';
import { TeamNameSection } from './TeamNameSection';
import { CurrencySection, ReminderSection } from './TeamSettingForm';
import { ViewerCommentSection } from './ViewerCommentSection';

export interface TeamSettingsProps {
	teamId: string;
	teamName: string;
	myRole: Role;
	myUserId: string;
	initialMembers: MemberDto[];
	reminderDays: number;
	currency: string;
	viewersMayComment: boolean;
}

export function TeamSettings(props: TeamSettingsProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			<TeamSettingsView {...props} />
		</QueryClientProvider>
	);
}

export function TeamSettingsView({
	teamId,
	teamName,
	myRole,
	myUserId,
	initialMembers,
	reminderDays,
	currency,
	viewersMayComment,
}: TeamSettingsProps) {
	const captain = myRole === 'captain';
	return (
		<div className="flex flex-col gap-10">
			<MembersSection
				teamId={teamId}
				captain={captain}
				myUserId={myUserId}
				initialMembers={initialMembers}
			/>
			{captain && <InviteSection teamId={teamId} />}
			{captain && <PendingSection teamId={teamId} />}
			{captain && <TeamNameSection teamId={teamId} teamName={teamName} />}
			{captain && <ReminderSection teamId={teamId} initialDays={reminderDays} />}
			{captain && <CurrencySection teamId={teamId} initial={currency} />}
			{captain && <ViewerCommentSection teamId={teamId} initial={viewersMayComment} />}
			<LeaveOrDeleteSection
				teamId={teamId}
				teamName={teamName}
				captain={captain}
				myUserId={myUserId}
			/>
		</div>
	);
}
