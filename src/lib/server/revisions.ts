import type { RevisionDto } from '@/lib/schemas/vehicles';
import { appendRevision, findHeadRevision, findRevision } from '@/lib/server/db/builds';
import { conflict, problem } from './http';
import type { BuildDocument } from '@/engine';

/**
 * Saves a revision, answering 201 with it, or 409 when someone saved first: the body carries the
 * current head (theirs) and echoes the draft (yours), so nothing is lost and the user can merge.
 */
export async function saveRevision(
	db: App.Locals['db'],
	p: {
		buildId: string;
		parentId: string | null;
		document: BuildDocument;
		message: string;
		authorId: string;
		restoredFromId?: string | null;
	},
): Promise<Response> {
	const result = await appendRevision(db, p);
	if (!result.ok) {
		const head = await findHeadRevision(db, p.buildId);
		return conflict(
			`Someone saved revision ${head?.number ?? '?'} of this build after you started. Your changes are kept: compare and save again.`,
			{
				head: head ?? null,
				yours: { parentId: p.parentId, message: p.message, document: p.document },
			},
		);
	}
	const saved = (await findRevision(db, p.buildId, result.revision.id)) as RevisionDto;
	return Response.json(saved, { status: 201 });
}

export { problem };
