import { QueryClientProvider, useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { type BuildDocument } from '@/engine/browser';
import { api } from '@/lib/client/api-client';
import { getQueryClient } from '@/lib/client/query-client';

import { type PlanDto } from '@/lib/client/queries/plans';
import { type UnitSystem } from '@/lib/format';

import { FormMessage } from '@/components/ui/Field';

import { unpackJson } from '@/lib/packed-json';

import { PlanWorkspaceView } from './PlanWorkspaceView';

export interface PlanWorkspaceProps {
	teamId: string;
	vehicleId: string;
	canEdit: boolean;
	currency: string;
	/** The plan without its document, which comes as JSON text beside it. */
	plan: Omit<PlanDto, 'document'>;
	/**
	 * The plan's document, packed (`packJson`): the page hands a document over as one string with
	 * nothing to escape. Null for a plan too large to come with the page: the island fetches it
	 * (and its base revision's) once live.
	 */
	documentPacked: string | null;
	/** How many parts the plan's document has (for the loading note of a large one). */
	documentParts?: number;
	/** The document of the revision the plan started from (packed), to show what the plan changes. */
	baseDocumentPacked: string | null;
	head: { id: string; number: number } | null;
	units: UnitSystem;
}

export function PlanWorkspace(props: PlanWorkspaceProps) {
	return (
		<QueryClientProvider client={getQueryClient()}>
			{props.documentPacked === null ? (
				<LargePlan {...props} />
			) : (
				<PackedPlan {...props} documentPacked={props.documentPacked} />
			)}
		</QueryClientProvider>
	);
}

function PackedPlan({
	plan,
	documentPacked,
	baseDocumentPacked,
	documentParts: _parts,
	...rest
}: PlanWorkspaceProps & { documentPacked: string }) {
	const full = useMemo(
		() => ({ ...plan, document: unpackJson<BuildDocument>(documentPacked) }),
		[plan, documentPacked],
	);
	const baseDocument = useMemo(
		() => (baseDocumentPacked ? unpackJson<BuildDocument>(baseDocumentPacked) : null),
		[baseDocumentPacked],
	);
	return <PlanWorkspaceView {...rest} plan={full} baseDocument={baseDocument} />;
}

/** A plan too large to come with the page: its documents are fetched once the page is live. */
function LargePlan({
	plan,
	documentParts,
	baseDocumentPacked: _base,
	documentPacked: _packed,
	...rest
}: PlanWorkspaceProps) {
	const { teamId, vehicleId } = rest;
	const loaded = useQuery({
		queryKey: ['plan-documents', plan.id, plan.version],
		queryFn: async ({ signal }) => {
			const [full, base] = await Promise.all([
				api<PlanDto>(`/api/teams/${teamId}/vehicles/${vehicleId}/plans/${plan.id}`, { signal }),
				plan.baseRevisionId
					? api<{ document: BuildDocument }>(
							`/api/teams/${teamId}/vehicles/${vehicleId}/revisions/${plan.baseRevisionId}`,
							{ signal },
						)
					: null,
			]);
			return { full, baseDocument: base?.document ?? null };
		},
		staleTime: Infinity,
		retry: 1,
	});
	if (loaded.data)
		return (
			<PlanWorkspaceView
				{...rest}
				plan={loaded.data.full}
				baseDocument={loaded.data.baseDocument}
			/>
		);
	return (
		<div className="rounded-md border border-hairline bg-card p-4" aria-live="polite">
			{loaded.isError ? (
				<FormMessage tone="error">
					The plan could not be loaded ({loaded.error.message}).{' '}
					<button type="button" className="underline" onClick={() => void loaded.refetch()}>
						Try again
					</button>
				</FormMessage>
			) : (
				<p className="text-sm text-ink-soft" role="status">
					Loading the plan’s {documentParts?.toLocaleString('en') ?? ''} parts…
				</p>
			)}
		</div>
	);
}
