import type { APIRoute } from 'astro';
import { z } from '@/lib/zod';
import { lineText } from '@/lib/schemas/text';
import { requireTeamRole } from '@/lib/server/access';
import { findCheckItems, insertCheckItem } from '@/lib/server/db/checklists';
import { readJson } from '@/lib/server/http';

const newItemSchema = z.object({ label: lineText(200, { required: 'Say what to check' }) });

export const GET: APIRoute = async ({ params, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'viewer');
	if (!auth.ok) return auth.response;
	return Response.json(await findCheckItems(locals.db, auth.value.teamId));
};

/** Adds a manual item to every pre-event checklist of the team. */
export const POST: APIRoute = async ({ params, request, locals }) => {
	const auth = await requireTeamRole(locals, params.teamId, 'member');
	if (!auth.ok) return auth.response;
	const body = await readJson(request, newItemSchema);
	if (!body.ok) return body.response;
	const row = await insertCheckItem(locals.db, auth.value.teamId, body.data.label);
	return Response.json(row, { status: 201 });
};
