import type { z } from 'zod';
import type { runFieldsSchema } from '../schemas/events';
import { findVehicle } from './db/builds';
import { findEvent, revisionBelongsTo, revisionInForce } from './db/runs';
import type { Role } from '@/lib/server/db/schema';
import { parseUuid } from '../schemas/ids';
import { requireTeamRole } from './authz';
import { findRun } from './db/runs';
import { type FieldError, problem } from './http';

type RunInput = Partial<z.infer<typeof runFieldsSchema>>;

/** Checks that the vehicle, event and revision of a run belong to the team; picks the revision in force. */
export async function resolveRunLinks(
	db: App.Locals['db'],
	teamId: string,
	vehicleId: string,
	input: RunInput,
): Promise<{ ok: true; revisionId: string | null | undefined } | { ok: false; errors: FieldError[] }> {
	const errors: FieldError[] = [];
	if (!(await findVehicle(db, teamId, vehicleId))) errors.push({ path: 'vehicleId', message: 'No such vehicle in this team' });
	if (input.eventId && !(await findEvent(db, teamId, input.eventId))) errors.push({ path: 'eventId', message: 'No such event in this team' });
	let revisionId = input.revisionId;
	if (revisionId && !(await revisionBelongsTo(db, vehicleId, revisionId))) errors.push({ path: 'revisionId', message: "Not a revision of this vehicle's build" });
	if (errors.length) return { ok: false, errors };
	if (revisionId === undefined && input.ranAt) revisionId = await revisionInForce(db, vehicleId, new Date(input.ranAt));
	return { ok: true, revisionId };
}

/** Team role check, then the run of the URL inside that team; anything else is a 404. */
export async function requireRun(locals: Pick<App.Locals, 'db' | 'user'>, params: Record<string, string | undefined>, min: Role) {
	const auth = await requireTeamRole(locals, params.teamId, min);
	if (!auth.ok) return auth;
	const id = parseUuid(params.runId);
	const run = id ? await findRun(locals.db, auth.access.teamId, id) : undefined;
	if (!run) return { ok: false as const, response: problem(404, 'not_found', 'No such run') };
	return { ok: true as const, access: auth.access, run };
}
