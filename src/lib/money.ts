/**
 * Money as whole minor units (cents) of the team's currency: typed text is read exactly, never
 * through a binary fraction, and shown back with two decimals. Every total is a sum of integers.
 */

/** The most a single price may be, in minor units (a billion in the currency). */
export const MAX_MINOR = 100_000_000_000;

const MONEY_TEXT = /^\s*(\d{1,9})(?:[.,](\d{1,2}))?\s*$/;

/**
 * Reads "129.95", "129,9" or "130" as minor units; `null` for anything else (a third decimal, a
 * sign, letters, a thousands separator). A blank is not a price either: callers decide what it means.
 */
export function parseMoney(text: string): number | null {
	const m = MONEY_TEXT.exec(text);
	if (!m) return null;
	const cents = (m[2] ?? '').padEnd(2, '0');
	return Number(m[1]) * 100 + Number(cents);
}

/** Minor units as plain text with two decimals ("129.95"), for fields and CSV. */
export function minorToText(minor: number): string {
	const sign = minor < 0 ? '-' : '';
	const abs = Math.abs(Math.trunc(minor));
	return `${sign}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}
