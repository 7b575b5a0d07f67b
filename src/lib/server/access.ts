import type { AstroGlobal } from 'astro';
import type { UnitSystem } from '@/engine';
import type { Role } from '@/lib/server/db/schema';
import type { RunInput } from '@/lib/schemas/runs';
import { parseUuid } from '@/lib/schemas/ids';
import { findRevision, revisionBelongsTo, revisionInForce } from '@/lib/server/db/builds';
import { findEvent } from '@/lib/server/db/events';
import { findPlan, findPlanForPage } from '@/lib/server/db/plans';
import { findRun } from '@/lib/server/db/runs';
import { findMembership } from '@/lib/server/db/teams';
import { findVehicle, findVehicleAndBuild } from '@/lib/server/db/vehicles';
import { type FieldError, problem } from '@/lib/server/http';

/**
 * Who may touch what: the one module. Every lookup answers the same shape — the thing found, or
 * the status and the problem response to send — so routes read `if (!found.ok) return found.response`.
 * A malformed id, a thing of another team and a thing that does not exist are all the same 404,
 * never revealing what exists elsewhere.
 */
export type Access<T> =
	{ ok: true; value: T } | { ok: false; status: 401 | 403 | 404; response: Response };

type Locals = Pick<App.Locals, 'db' | 'user'>;
type Params = Record<string, string | undefined>;

const RANK: Record<Role, number> = { viewer: 0, member: 1, captain: 2 };

export const roleAtLeast = (role: Role, min: Role) => RANK[role] >= RANK[min];

export interface TeamAccess {
	teamId: string;
	teamName: string;
	userId: string;
	role: Role;
	/** The team's data version as this request read it (see the team_data_version migration). */
	dataVersion: string;
	/** The caller's unit system, for what the page shows. */
	units: UnitSystem;
}

const notFound = (what: string) => ({
	ok: false as const,
	status: 404 as const,
	response: problem(404, 'not_found', `No such ${what}`),
});

/**
 * 401 when nobody is signed in, 404 when the id is malformed or the caller is not a member, 403
 * when the caller's role is below `min` (viewers read; members write; captains manage).
 */
export async function requireTeamRole(
	locals: Locals,
	teamIdParam: string | undefined,
	min: Role,
): Promise<Access<TeamAccess>> {
	if (!locals.user)
		return { ok: false, status: 401, response: problem(401, 'unauthenticated', 'Sign in first') };
	const teamId = parseUuid(teamIdParam);
	const membership = teamId ? await findMembership(locals.db, teamId, locals.user.id) : undefined;
	if (!membership) return notFound('team');
	if (!roleAtLeast(membership.role, min)) {
		return {
			ok: false,
			status: 403,
			response: problem(
				403,
				'forbidden',
				`This needs the ${min} role; you are ${membership.role === 'viewer' ? 'a viewer' : `a ${membership.role}`}`,
			),
		};
	}
	return {
		ok: true,
		value: {
			teamId: membership.team_id,
			teamName: membership.team_name,
			userId: membership.user_id,
			role: membership.role,
			dataVersion: membership.data_version,
			units: membership.unitSystem,
		},
	};
}

type Found = NonNullable<Awaited<ReturnType<typeof findVehicleAndBuild>>>;

export interface VehicleAccess {
	access: TeamAccess;
	vehicle: Found['vehicle'];
	build: Found['build'];
}

/** Team role check, then the vehicle (and its build) of the URL inside that team. */
export async function requireVehicle(
	locals: Locals,
	params: Params,
	min: Role,
): Promise<Access<VehicleAccess>> {
	const teamId = parseUuid(params.teamId);
	const vehicleId = parseUuid(params.vehicleId);
	// Both lookups at once; the vehicle and its build are only looked at once the role passes.
	const [auth, found] = await Promise.all([
		requireTeamRole(locals, params.teamId, min),
		locals.user && teamId && vehicleId
			? findVehicleAndBuild(locals.db, teamId, vehicleId)
			: undefined,
	]);
	if (!auth.ok) return auth;
	if (!found) return notFound('vehicle');
	return { ok: true, value: { access: auth.value, ...found } };
}

type RevisionRow = NonNullable<Awaited<ReturnType<typeof findRevision>>>;

/** requireVehicle, then what `find` makes of the URL's revision id (a 404 when it finds nothing). */
async function requireVehicleRevision<T>(
	locals: Locals,
	params: Params,
	min: Role,
	find: (found: VehicleAccess, revisionId: string) => Promise<T | undefined>,
): Promise<Access<VehicleAccess & T>> {
	const found = await requireVehicle(locals, params, min);
	if (!found.ok) return found;
	const id = parseUuid(params.revisionId);
	const value = id ? await find(found.value, id) : undefined;
	if (!value) return notFound('revision');
	return { ok: true, value: { ...found.value, ...value } };
}

/** requireVehicle, then the revision of the URL in that vehicle's build. */
export const requireRevision = (locals: Locals, params: Params, min: Role) =>
	requireVehicleRevision(locals, params, min, async ({ build }, id) => {
		const revision: RevisionRow | undefined = await findRevision(locals.db, build.id, id);
		return revision && { revision };
	});

/**
 * requireVehicle, then only the id of the URL's revision once it is known to be in that vehicle's
 * build: for answers cached by revision, whose document is read only on a miss.
 */
export const requireRevisionId = (locals: Locals, params: Params, min: Role) =>
	requireVehicleRevision(locals, params, min, async ({ vehicle }, id) =>
		(await revisionBelongsTo(locals.db, vehicle.id, id)) ? { revisionId: id } : undefined,
	);

type PlanRow = NonNullable<Awaited<ReturnType<typeof findPlan>>>;

/** requireVehicle, then the plan of the URL (a plan of another vehicle is a 404). */
export async function requirePlan(
	locals: Locals,
	params: Params,
	min: Role,
): Promise<Access<VehicleAccess & { plan: PlanRow }>> {
	const found = await requireVehicle(locals, params, min);
	if (!found.ok) return found;
	const id = parseUuid(params.planId);
	const plan = id ? await findPlan(locals.db, found.value.vehicle.id, id) : undefined;
	if (!plan) return notFound('plan');
	return { ok: true, value: { ...found.value, plan } };
}

type RunRow = NonNullable<Awaited<ReturnType<typeof findRun>>>;

/** Team role check, then the run of the URL inside that team. */
export async function requireRun(
	locals: Locals,
	params: Params,
	min: Role,
): Promise<Access<{ access: TeamAccess; run: RunRow }>> {
	const auth = await requireTeamRole(locals, params.teamId, min);
	if (!auth.ok) return auth;
	const id = parseUuid(params.runId);
	const run = id ? await findRun(locals.db, auth.value.teamId, id) : undefined;
	if (!run) return notFound('run');
	return { ok: true, value: { access: auth.value, run } };
}

type EventRow = NonNullable<Awaited<ReturnType<typeof findEvent>>>;

/** Team role check, then the event of the URL inside that team. */
export async function requireEvent(
	locals: Locals,
	params: Params,
	min: Role,
): Promise<Access<{ access: TeamAccess; event: EventRow }>> {
	const auth = await requireTeamRole(locals, params.teamId, min);
	if (!auth.ok) return auth;
	const id = parseUuid(params.eventId);
	const event = id ? await findEvent(locals.db, auth.value.teamId, id) : undefined;
	if (!event) return notFound('event');
	return { ok: true, value: { access: auth.value, event } };
}

/** Checks that the vehicle, event and revision a run names belong to the team; picks the revision in force. */
export async function resolveRunLinks(
	db: App.Locals['db'],
	teamId: string,
	vehicleId: string,
	input: RunInput,
): Promise<
	{ ok: true; revisionId: string | null | undefined } | { ok: false; errors: FieldError[] }
> {
	const errors: FieldError[] = [];
	if (!(await findVehicle(db, teamId, vehicleId)))
		errors.push({ path: 'vehicleId', message: 'No such vehicle in this team' });
	if (input.eventId && !(await findEvent(db, teamId, input.eventId)))
		errors.push({ path: 'eventId', message: 'No such event in this team' });
	let revisionId = input.revisionId;
	if (revisionId && !(await revisionBelongsTo(db, vehicleId, revisionId)))
		errors.push({ path: 'revisionId', message: "Not a revision of this vehicle's build" });
	if (errors.length) return { ok: false, errors };
	if (revisionId === undefined && input.ranAt)
		revisionId = await revisionInForce(db, vehicleId, new Date(input.ranAt));
	return { ok: true, revisionId };
}

// ---- pages: the same decisions, answered as pages

/** What a page does with a refusal: anonymous → sign-in, 403 → the 403 page, anything else → the 404 page. */
export function refusalPage(
	astro: AstroGlobal,
	refused: { status: 401 | 403 | 404 },
): Response | Promise<Response> {
	if (refused.status === 401)
		return astro.redirect(`/sign-in?callbackUrl=${encodeURIComponent(astro.url.pathname)}`);
	if (refused.status === 403) {
		astro.response.status = 403;
		return astro.rewrite('/403');
	}
	return astro.rewrite('/404');
}

/** requireTeamRole for a page: the access, or the Response the page should return. */
export async function teamPageAccess(
	astro: AstroGlobal,
	min: Role = 'viewer',
): Promise<TeamAccess | Response> {
	const result = await requireTeamRole(astro.locals, astro.params.teamId, min);
	return result.ok ? result.value : refusalPage(astro, result);
}

/** requireVehicle for a page. */
export async function vehiclePageAccess(
	astro: AstroGlobal,
	min: Role = 'viewer',
): Promise<VehicleAccess | Response> {
	const result = await requireVehicle(astro.locals, astro.params, min);
	return result.ok ? result.value : refusalPage(astro, result);
}

type PlanForPage = NonNullable<Awaited<ReturnType<typeof findPlanForPage>>>;

/**
 * requirePlan for the plan's page: the plan without its document, which comes as JSON text when
 * it has at most `inlineParts` parts (the island fetches a larger one once live).
 */
export async function planPageAccess(
	astro: AstroGlobal,
	inlineParts: number,
	min: Role = 'viewer',
): Promise<(VehicleAccess & PlanForPage) | Response> {
	const found = await requireVehicle(astro.locals, astro.params, min);
	if (!found.ok) return refusalPage(astro, found);
	const id = parseUuid(astro.params.planId);
	const plan = id
		? await findPlanForPage(astro.locals.db, found.value.vehicle.id, id, inlineParts)
		: undefined;
	if (!plan) return refusalPage(astro, notFound('plan'));
	return { ...found.value, ...plan };
}

/** requireEvent for a page. */
export async function eventPageAccess(
	astro: AstroGlobal,
	min: Role = 'viewer',
): Promise<{ access: TeamAccess; event: EventRow } | Response> {
	const result = await requireEvent(astro.locals, astro.params, min);
	return result.ok ? result.value : refusalPage(astro, result);
}
