import { randomBytes, scrypt as scryptCb, timingSafeEqual } from 'node:crypto';

// scrypt from node:crypto (a memory-hard KDF). N = 2^15, r = 8, p = 1 needs 32 MiB per hash.
const N = 2 ** 15;
const R = 8;
const P = 1;
const KEY_LENGTH = 32;
const MAX_MEM = 64 * 1024 * 1024;

function scrypt(password: string, salt: Buffer, n: number, r: number, p: number): Promise<Buffer> {
	return new Promise((resolve, reject) =>
		scryptCb(
			password.normalize('NFKC'),
			salt,
			KEY_LENGTH,
			{ N: n, r, p, maxmem: MAX_MEM },
			(err, key) => (err ? reject(err) : resolve(key)),
		),
	);
}

/** `scrypt$N$r$p$salt$hash`, salt and hash in base64url. */
export async function hashPassword(password: string): Promise<string> {
	const salt = randomBytes(16);
	const key = await scrypt(password, salt, N, R, P);
	return ['scrypt', N, R, P, salt.toString('base64url'), key.toString('base64url')].join('$');
}

export async function verifyPassword(password: string, stored: string | null): Promise<boolean> {
	if (!stored) return false;
	const [scheme, n, r, p, salt, hash] = stored.split('$');
	if (scheme !== 'scrypt' || !salt || !hash) return false;
	const expected = Buffer.from(hash, 'base64url');
	const actual = await scrypt(
		password,
		Buffer.from(salt, 'base64url'),
		Number(n),
		Number(r),
		Number(p),
	);
	return actual.length === expected.length && timingSafeEqual(actual, expected);
}

let dummyHash: Promise<string> | undefined;

/**
 * Checks a password against a stored hash, or against a throwaway hash when there is none, so an
 * unknown address takes as long to refuse as a wrong password for a known one.
 */
export async function verifyPasswordOrDummy(
	password: string,
	stored: string | null,
): Promise<boolean> {
	if (stored) return verifyPassword(password, stored);
	dummyHash ??= hashPassword('no account has this password');
	await verifyPassword(password, await dummyHash);
	return false;
}
