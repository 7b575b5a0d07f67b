/**
 * The database, typed by hand beside the migrations (one interface per table).
 * Measured quantities are double precision in SI units; build documents are JSONB.
 */
import type { ColumnType, Generated, Selectable } from 'kysely';
import type { RunNumberColumns } from '@/lib/schemas/run-measurements';
import type { Role } from '@/lib/schemas/teams';

type Timestamp = ColumnType<Date, Date | string, Date | string>;
/** A timestamp the database fills in by default. */
type DefaultTimestamp = ColumnType<Date, Date | string | undefined, Date | string>;

export interface TeamTable {
	id: Generated<string>;
	name: string;
	/** Days before an event that members get a reminder. */
	reminder_days: Generated<number>;
	/** Distance within which a battery cable's fuse must sit, for the pre-event checks (m). */
	fuse_distance_m: Generated<number>;
	/** ISO 4217 code that plan prices are in. */
	currency: Generated<string>;
	last_digest_at: Timestamp | null;
	/** Whether viewers (a sponsor, an advising shop) may comment; off unless a captain allows it. */
	viewers_may_comment: Generated<boolean>;
	created_at: DefaultTimestamp;
	/** Bumped by the database at each commit that changes what the team page reads (pg bigint: a string). */
	data_version: ColumnType<string, never, never>;
}

export interface NotificationSentTable {
	kind: 'event_reminder' | 'revision_digest' | 'mention_digest';
	subject_key: string;
	user_id: string;
	sent_at: DefaultTimestamp;
}

export interface VehicleTable {
	id: Generated<string>;
	team_id: string;
	name: string;
	description: Generated<string>;
	competition_class: Generated<string>;
	notes: Generated<string>;
	archived_at: Timestamp | null;
	owner_id: string | null;
	/** The owner's address as recorded in a restored backup (never a live account). */
	imported_by: string | null;
	created_at: DefaultTimestamp;
}

export interface BuildTable {
	id: Generated<string>;
	vehicle_id: string;
	head_revision_id: string | null;
	created_at: DefaultTimestamp;
}

export interface RevisionTable {
	id: Generated<string>;
	build_id: string;
	parent_id: string | null;
	number: number;
	schema_version: number;
	/** The build document (src/engine/types BuildDocument), validated before it is written. */
	document: ColumnType<unknown, string, never>;
	message: string;
	author_id: string | null;
	/** The author as recorded in a restored backup (never a live account). */
	imported_by: string | null;
	restored_from_id: string | null;
	created_at: DefaultTimestamp;
}

export type { Role } from '@/lib/schemas/teams';

export interface UserTable {
	id: string;
	name: string | null;
	email: string;
	emailVerified: Timestamp | null;
	image: string | null;
	passwordHash: string | null;
	unitSystem: Generated<'imperial' | 'metric'>;
	createdAt: DefaultTimestamp;
	/** Bumped by a password reset or a first e-mail sign-in: sessions issued under an older version end. */
	sessionVersion: Generated<number>;
	/** How mentions reach this person by e-mail: at once, in a daily digest, or not at all. */
	mention_mail: Generated<'immediate' | 'daily' | 'off'>;
}

export interface AccountTable {
	id: Generated<string>;
	userId: string;
	type: string;
	provider: string;
	providerAccountId: string;
	refresh_token: string | null;
	access_token: string | null;
	expires_at: number | null;
	token_type: string | null;
	scope: string | null;
	id_token: string | null;
	session_state: string | null;
}

export interface SessionTable {
	id: Generated<string>;
	sessionToken: string;
	userId: string;
	expires: Timestamp;
}

export interface VerificationTokenTable {
	identifier: string;
	token: string;
	expires: Timestamp;
}

export interface MembershipTable {
	team_id: string;
	user_id: string;
	role: Role;
	created_at: DefaultTimestamp;
}

export interface InvitationTable {
	id: Generated<string>;
	team_id: string;
	email: string;
	role: Role;
	token_hash: string;
	invited_by: string | null;
	created_at: DefaultTimestamp;
	last_sent_at: DefaultTimestamp;
	expires_at: Timestamp;
	accepted_at: Timestamp | null;
	accepted_by: string | null;
	revoked_at: Timestamp | null;
}

export interface PasswordResetTable {
	id: Generated<string>;
	user_id: string;
	token_hash: string;
	created_at: DefaultTimestamp;
	expires_at: Timestamp;
	used_at: Timestamp | null;
}

export interface RateEventTable {
	id: Generated<number>;
	kind: 'reset_mail' | 'link_mail' | 'sign_up';
	email: string;
	client: string;
	created_at: DefaultTimestamp;
}

export interface SignInAttemptTable {
	id: Generated<number>;
	email: string;
	client: string;
	succeeded: boolean;
	created_at: DefaultTimestamp;
}

export interface EventTable {
	id: Generated<string>;
	team_id: string;
	name: string;
	/** Dates as yyyy-MM-dd strings (no time zone). */
	starts_on: ColumnType<string, string, string>;
	ends_on: ColumnType<string, string, string>;
	place: Generated<string>;
	format: Generated<string>;
	notes: Generated<string>;
	created_at: DefaultTimestamp;
}

/** The measured numbers' columns come from their one definition (src/lib/schemas/run-measurements.ts). */
export interface RunTable extends RunNumberColumns {
	id: Generated<string>;
	vehicle_id: string;
	event_id: string | null;
	revision_id: string | null;
	ran_at: Timestamp;
	/** The UTC offset the time was entered with (minutes east of UTC), to show it as the lanes saw it. */
	ran_at_offset_min: number | null;
	/** The logging device's idempotency key: a retried write finds this run instead of adding one. */
	client_key: string | null;
	/** The logger file's resting voltage (before the burp) and minimum, beside the typed ones. */
	logger_resting_v: number | null;
	logger_min_v: number | null;
	notes: Generated<string>;
	author_id: string | null;
	/** As recorded in a restored backup (never a live account of this installation). */
	imported_by: string | null;
	created_at: DefaultTimestamp;
}

export interface StoredFileTable {
	id: Generated<string>;
	team_id: string;
	run_id: string | null;
	/** The purchase a receipt belongs to (receipts only). */
	purchase_id: string | null;
	kind: 'logger' | 'photo' | 'thumbnail' | 'receipt';
	object_key: string;
	file_name: string;
	content_type: string;
	size_bytes: number;
	created_at: DefaultTimestamp;
}

export interface RunSampleTable {
	run_id: string;
	seq: number;
	t_s: number;
	volts: number;
	amps: number;
}

export interface CheckItemTable {
	id: Generated<string>;
	team_id: string;
	label: string;
	created_at: DefaultTimestamp;
}

export interface CheckSignoffTable {
	event_id: string;
	vehicle_id: string;
	item_key: string;
	signed_by: string | null;
	/** As recorded in a restored backup (never a live account of this installation). */
	imported_by: string | null;
	signed_at: DefaultTimestamp;
	/** For a waiver, the captain's reason. */
	note: Generated<string>;
	/** A failing computed item accepted by a captain with a reason: shown as waived, never as passed. */
	waived: Generated<boolean>;
	/** The revision in force when the item was signed off or waived (null: from before it was kept). */
	revision_id: string | null;
	/** A waiver's figure when it was given (e.g. the worst drop, V), where the item has one. */
	waived_value: number | null;
	/** The findings a waiver accepted, as they read when it was given. */
	waived_reasons: ColumnType<string[] | null, string | null, string | null>;
}

export interface PlanTable {
	id: Generated<string>;
	vehicle_id: string;
	name: string;
	notes: Generated<string>;
	base_revision_id: string | null;
	schema_version: number;
	/** A build document, validated before it is written. */
	document: ColumnType<unknown, string, string>;
	/** Bumped on every save; a save naming an older version is refused (409). */
	version: Generated<number>;
	created_by: string | null;
	/** As recorded in a restored backup (never a live account of this installation). */
	imported_by: string | null;
	installed_revision_id: string | null;
	installed_at: Timestamp | null;
	created_at: DefaultTimestamp;
	updated_at: DefaultTimestamp;
}

export interface PlanPartTable {
	plan_id: string;
	position: number;
	item: string;
	quantity: number;
	/** Price of one, in minor units (cents) of the team's currency. bigint arrives as a string. */
	unit_price_minor: ColumnType<string, number, number>;
	link: Generated<string>;
}

export interface ShelfItemTable {
	id: Generated<string>;
	team_id: string;
	/** One of SHELF_KINDS. */
	kind: string;
	label: string;
	/** The part's fields the engine needs, checked by the kind's schema before it is written. */
	spec: ColumnType<unknown, string, string>;
	/** Price of one (a cable's per metre), in minor units of the team's currency; bigint arrives as a string. */
	price_minor: ColumnType<string | null, number | null, number | null>;
	supplier: Generated<string>;
	link: Generated<string>;
	owned: Generated<number>;
	notes: Generated<string>;
	created_at: DefaultTimestamp;
	updated_at: DefaultTimestamp;
}

export interface SeasonTable {
	id: Generated<string>;
	team_id: string;
	name: string;
	/** YYYY-MM-DD. */
	starts_on: ColumnType<string, string, string>;
	ends_on: ColumnType<string, string, string>;
	/** Minor units of the team's currency; bigint arrives as a string. */
	budget_minor: ColumnType<string, number, number>;
	created_at: DefaultTimestamp;
}

export interface PurchaseTable {
	id: Generated<string>;
	season_id: string;
	bought_on: ColumnType<string, string, string>;
	shelf_item_id: string | null;
	item: string;
	quantity: number;
	unit_price_minor: ColumnType<string, number, number>;
	paid_by: string | null;
	paid_by_name: Generated<string>;
	/** As recorded in a restored backup (never a live account of this installation). */
	imported_by: string | null;
	notes: Generated<string>;
	created_by: string | null;
	created_at: DefaultTimestamp;
}

/** A comment on exactly one subject: a revision, a run, a plan or an event of the team. */
export interface CommentTable {
	id: Generated<string>;
	team_id: string;
	revision_id: string | null;
	run_id: string | null;
	plan_id: string | null;
	event_id: string | null;
	author_id: string | null;
	author_name: Generated<string>;
	imported_by: string | null;
	body: string;
	created_at: DefaultTimestamp;
	edited_at: Timestamp | null;
}

/** A mention of a member in a comment: read in the app, mailed at once or in a digest. */
export interface NotificationTable {
	id: Generated<string>;
	user_id: string;
	team_id: string;
	comment_id: string;
	created_at: DefaultTimestamp;
	read_at: Timestamp | null;
	mailed_at: Timestamp | null;
}

export interface Database {
	comment: CommentTable;
	notification: NotificationTable;
	season: SeasonTable;
	purchase: PurchaseTable;
	shelf_item: ShelfItemTable;
	plan: PlanTable;
	plan_part: PlanPartTable;
	check_item: CheckItemTable;
	check_signoff: CheckSignoffTable;
	notification_sent: NotificationSentTable;
	event: EventTable;
	run: RunTable;
	stored_file: StoredFileTable;
	run_sample: RunSampleTable;
	team: TeamTable;
	vehicle: VehicleTable;
	build: BuildTable;
	revision: RevisionTable;
	User: UserTable;
	Account: AccountTable;
	Session: SessionTable;
	VerificationToken: VerificationTokenTable;
	membership: MembershipTable;
	invitation: InvitationTable;
	password_reset: PasswordResetTable;
	sign_in_attempt: SignInAttemptTable;
	rate_event: RateEventTable;
}

export type UserRow = Selectable<UserTable>;
export type InvitationRow = Selectable<InvitationTable>;

export type VehicleRow = Selectable<VehicleTable>;
export type RevisionRow = Selectable<RevisionTable>;
