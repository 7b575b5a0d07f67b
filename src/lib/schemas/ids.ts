import { z } from '@/lib/zod';

const uuid = z.uuid();

/** The value when it is a UUID, otherwise null (so a bad id answers 404, not a database error). */
export function parseUuid(value: string | undefined | null): string | null {
	const r = uuid.safeParse(value);
	return r.success ? r.data : null;
}
