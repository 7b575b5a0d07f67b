import type { Session } from '@auth/core/types';

/** The signed-in person as the app sees them. The only module that knows Auth.js's session shape. */
export interface AppUser {
	id: string;
	email: string;
	name: string | null;
}

export function toAppUser(session: Session | null): AppUser | null {
	const u = session?.user as (Session['user'] & { id?: string }) | undefined;
	if (!u?.id || !u.email) return null;
	return { id: u.id, email: u.email.toLowerCase(), name: u.name ?? null };
}
