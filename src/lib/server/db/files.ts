import type { Kysely } from 'kysely';
import type { Database } from '@/lib/server/db/schema';
import type { RunPhoto } from '@/lib/schemas/runs';

type Db = Kysely<Database>;

/** The object keys of every stored file of one run. */
export async function objectKeysOfRun(db: Db, runId: string): Promise<string[]> {
	return (
		await db.selectFrom('stored_file').select('object_key').where('run_id', '=', runId).execute()
	).map((f) => f.object_key);
}

/** Which of these object keys a stored file row still points at. */
export async function knownObjectKeys(db: Db, keys: string[]): Promise<Set<string>> {
	const known = new Set<string>();
	for (let i = 0; i < keys.length; i += 500) {
		const rows = await db
			.selectFrom('stored_file')
			.select('object_key')
			.where('object_key', 'in', keys.slice(i, i + 500))
			.execute();
		for (const r of rows) known.add(r.object_key);
	}
	return known;
}

/** A stored file of the team, by id (another team's file is not found). */
export function findTeamFile(db: Db, teamId: string, fileId: string) {
	return db
		.selectFrom('stored_file')
		.selectAll()
		.where('team_id', '=', teamId)
		.where('id', '=', fileId)
		.executeTakeFirst();
}

/** Records a photo and its thumbnail, both or neither. */
export async function insertPhotoPair(
	db: Db,
	p: {
		teamId: string;
		runId: string;
		fileName: string;
		photo: { objectKey: string; contentType: string; sizeBytes: number };
		thumbnail: { objectKey: string; sizeBytes: number };
	},
): Promise<{ photoId: string; thumbnailId: string }> {
	return db.transaction().execute(async (trx) => {
		const photo = await trx
			.insertInto('stored_file')
			.values({
				team_id: p.teamId,
				run_id: p.runId,
				kind: 'photo',
				object_key: p.photo.objectKey,
				file_name: p.fileName,
				content_type: p.photo.contentType,
				size_bytes: p.photo.sizeBytes,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const thumb = await trx
			.insertInto('stored_file')
			.values({
				team_id: p.teamId,
				run_id: p.runId,
				kind: 'thumbnail',
				object_key: p.thumbnail.objectKey,
				file_name: `${p.fileName.slice(0, 190)} (thumbnail)`,
				content_type: 'image/webp',
				size_bytes: p.thumbnail.sizeBytes,
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		return { photoId: photo.id, thumbnailId: thumb.id };
	});
}

/** A run's photos, oldest first, each with the id of its thumbnail (paired by object key). */
export async function findRunPhotos(db: Db, runId: string): Promise<RunPhoto[]> {
	const files = await db
		.selectFrom('stored_file')
		.select(['id', 'kind', 'object_key', 'file_name'])
		.where('run_id', '=', runId)
		.where('kind', 'in', ['photo', 'thumbnail'])
		.orderBy('created_at')
		.execute();
	return files
		.filter((f) => f.kind === 'photo')
		.map((p) => ({
			id: p.id,
			name: p.file_name,
			thumbnailId:
				files.find(
					(f) =>
						f.kind === 'thumbnail' &&
						f.object_key === p.object_key.replace(/\.\w+$/, '-thumb.webp'),
				)?.id ?? null,
		}));
}
