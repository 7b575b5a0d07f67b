import { randomUUID } from 'node:crypto';
import type { Kysely } from 'kysely';
import type { Database, Role } from '../../src/lib/server/db/schema';
import type { AppUser } from '../../src/lib/server/auth';
import type { ServerConfig } from '../../src/lib/server/config';
import type { Mailer } from '../../src/lib/server/mail';
import type { Storage } from '../../src/lib/server/storage';
import { hashPassword } from '../../src/lib/server/passwords';

export const TEST_CONFIG: ServerConfig = {
	publicUrl: 'http://app.test',
	smtpUrl: 'smtp://unused',
	mailFrom: 'tests@sagwise.test',
	devOutboxDir: null,
	linkSigningKey: 'test-link-key',
	s3: {
		endpoint: null,
		region: 'us-east-1',
		bucket: 'unused',
		accessKeyId: 'x',
		secretAccessKey: 'x',
		forcePathStyle: true,
	},
};

export const nullMailer: Mailer = { send: async () => {} };

let cachedHash: string | undefined;
export const TEST_PASSWORD = 'correct horse battery';

export async function makeUser(
	db: Kysely<Database>,
	email = `u${randomUUID().slice(0, 8)}@sagwise.test`,
	name = 'Test Person',
): Promise<AppUser> {
	cachedHash ??= await hashPassword(TEST_PASSWORD);
	const id = randomUUID();
	await db.insertInto('User').values({ id, email, name, passwordHash: cachedHash }).execute();
	return { id, email, name };
}

export async function makeTeam(db: Kysely<Database>, name = 'Test Team'): Promise<string> {
	const t = await db.insertInto('team').values({ name }).returning('id').executeTakeFirstOrThrow();
	return t.id;
}

export async function addMember(
	db: Kysely<Database>,
	teamId: string,
	user: AppUser,
	role: Role,
): Promise<void> {
	await db.insertInto('membership').values({ team_id: teamId, user_id: user.id, role }).execute();
}

/** Files kept in memory, for routes whose tests do not look at storage. */
export function memoryStorage(): Storage & { objects: Map<string, Uint8Array> } {
	const objects = new Map<string, Uint8Array>();
	return {
		objects,
		put: async (key, body) => void objects.set(key, body),
		get: async (key) => objects.get(key) ?? null,
		remove: async (key) => void objects.delete(key),
		list: async (prefix) =>
			[...objects.keys()]
				.filter((k) => k.startsWith(prefix))
				.map((key) => ({ key, lastModified: null })),
		ping: async () => {},
	};
}

export function localsFor(
	db: Kysely<Database>,
	user: AppUser | null,
	mailer: Mailer = nullMailer,
	storage: Storage = memoryStorage(),
): App.Locals {
	return { db, user, mailer, config: TEST_CONFIG, storage };
}
