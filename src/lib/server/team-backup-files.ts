import type { ImportedFile } from '@/lib/server/db/backup-insert';
import { checkLoggerFile, checkPhoto, checkThumbnail } from '@/lib/server/file-content';
import type { TeamBackupContent } from '@/lib/schemas/team-backup';

export type PrepareFilesResult =
	| {
			ok: true;
			files: ImportedFile[][];
			/** Receipt photos by `season.purchase` index. */
			receipts: Map<string, ImportedFile>;
			photosCleaned: number;
	  }
	| { ok: false; errors: { path: string; message: string }[] };

const stem = (objectName: string) => objectName.replace(/\.[^.]*$/, '');

/**
 * Checks every file of a backup by its content, exactly as an upload is checked, before anything is
 * written: photos must be JPEG, PNG or WebP (their metadata is removed), thumbnails WebP, logger
 * files CSV text. The file's own type, object name and size are never trusted; the object name is
 * used only to pair a thumbnail with its photo inside one run.
 */
export async function prepareBackupFiles(t: TeamBackupContent): Promise<PrepareFilesResult> {
	const errors: { path: string; message: string }[] = [];
	const out: ImportedFile[][] = [];
	let photosCleaned = 0;
	for (const [i, r] of t.runs.entries()) {
		const files: ImportedFile[] = [];
		const photoByStem = new Map<string, number>();
		r.files.forEach((f, j) => f.kind === 'photo' && photoByStem.set(stem(f.objectName), j));
		for (const [j, f] of r.files.entries()) {
			const path = `team.runs.${i}.files.${j}`;
			const bytes = new Uint8Array(Buffer.from(f.data, 'base64'));
			// Its text is not needed again: let it go while the rest is checked and written.
			f.data = '';
			const base = {
				fileName: f.fileName.slice(0, 200),
				createdAt: f.createdAt,
				sourceIndex: j,
				pairedWith: null,
			};
			if (f.kind === 'photo') {
				const checked = await checkPhoto(bytes);
				if (!checked.ok)
					errors.push({ path, message: `Photo "${f.fileName}": ${checked.message}` });
				else {
					if (checked.stripped) photosCleaned++;
					files.push({ ...base, kind: 'photo', contentType: checked.type, bytes: checked.bytes });
				}
			} else if (f.kind === 'thumbnail') {
				const checked = await checkThumbnail(bytes);
				const photo = photoByStem.get(stem(f.objectName).replace(/-thumb$/, ''));
				if (!checked.ok)
					errors.push({ path, message: `Thumbnail "${f.fileName}": ${checked.message}` });
				else if (photo === undefined)
					errors.push({
						path,
						message: `Thumbnail "${f.fileName}" belongs to no photo of this run`,
					});
				else
					files.push({
						...base,
						kind: 'thumbnail',
						contentType: 'image/webp',
						bytes,
						pairedWith: photo,
					});
			} else {
				const checked = checkLoggerFile(bytes);
				if (!checked.ok)
					errors.push({ path, message: `Logger file "${f.fileName}": ${checked.message}` });
				else files.push({ ...base, kind: 'logger', contentType: 'text/csv', bytes });
			}
			if (errors.length >= 10) return { ok: false, errors };
		}
		out.push(files);
	}
	const receipts = new Map<string, ImportedFile>();
	for (const [i, season] of t.seasons.entries())
		for (const [j, p] of season.purchases.entries()) {
			if (!p.receipt) continue;
			const bytes = new Uint8Array(Buffer.from(p.receipt.data, 'base64'));
			p.receipt.data = '';
			const checked = await checkPhoto(bytes);
			if (!checked.ok) {
				errors.push({
					path: `team.seasons.${i}.purchases.${j}.receipt`,
					message: `Receipt "${p.receipt.fileName}": ${checked.message}`,
				});
				if (errors.length >= 10) return { ok: false, errors };
				continue;
			}
			if (checked.stripped) photosCleaned++;
			receipts.set(`${i}.${j}`, {
				kind: 'receipt',
				fileName: p.receipt.fileName.slice(0, 200),
				contentType: checked.type,
				bytes: checked.bytes,
				createdAt: p.receipt.createdAt,
				sourceIndex: j,
				pairedWith: null,
			});
		}
	return errors.length ? { ok: false, errors } : { ok: true, files: out, receipts, photosCleaned };
}
