/**
 * Settling up a season: what each person paid against an even share of everything bought,
 * exact to the minor unit. The share is split among the team's current paying members; the cents
 * that do not divide go one each to the first members in a fixed order, so shares sum to the
 * total and balances to zero. Someone who paid but is no longer a member has no share: the team
 * owes them what they paid.
 */
export interface SettleMember {
	id: string;
	name: string;
}

export interface SettlePayment {
	/** The member who paid (an account id), or null for someone no longer on the team. */
	paidBy: string | null;
	paidByName: string;
	amountMinor: number;
}

export interface SettleLine {
	id: string;
	name: string;
	paidMinor: number;
	shareMinor: number;
	/** Paid less share: above zero the others owe them, below zero they owe. */
	balanceMinor: number;
}

export interface SettleTransfer {
	from: string;
	to: string;
	amountMinor: number;
}

export interface Settlement {
	totalMinor: number;
	lines: SettleLine[];
	transfers: SettleTransfer[];
}

export function settleUp(members: SettleMember[], payments: SettlePayment[]): Settlement {
	const ordered = [...members].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
	const lines = new Map<string, SettleLine>();
	for (const m of ordered)
		lines.set(m.id, { id: m.id, name: m.name, paidMinor: 0, shareMinor: 0, balanceMinor: 0 });
	let totalMinor = 0;
	for (const p of payments) {
		totalMinor += p.amountMinor;
		const key = p.paidBy !== null && lines.has(p.paidBy) ? p.paidBy : `former:${p.paidByName}`;
		const line = lines.get(key) ?? {
			id: key,
			name: p.paidByName || 'Someone no longer on the team',
			paidMinor: 0,
			shareMinor: 0,
			balanceMinor: 0,
		};
		line.paidMinor += p.amountMinor;
		lines.set(key, line);
	}
	if (ordered.length > 0) {
		const base = Math.floor(totalMinor / ordered.length);
		const extra = totalMinor - base * ordered.length;
		ordered.forEach((m, i) => (lines.get(m.id)!.shareMinor = base + (i < extra ? 1 : 0)));
	}
	for (const line of lines.values()) line.balanceMinor = line.paidMinor - line.shareMinor;
	return { totalMinor, lines: [...lines.values()], transfers: transfersFor([...lines.values()]) };
}

/** Who pays whom: the one who owes most pays the one owed most, until every balance is zero. */
function transfersFor(lines: SettleLine[]): SettleTransfer[] {
	const owed = lines.filter((l) => l.balanceMinor > 0).map((l) => ({ ...l, left: l.balanceMinor }));
	const owing = lines
		.filter((l) => l.balanceMinor < 0)
		.map((l) => ({ ...l, left: -l.balanceMinor }));
	const out: SettleTransfer[] = [];
	const byLeft = (a: { left: number; id: string }, b: { left: number; id: string }) =>
		b.left - a.left || (a.id < b.id ? -1 : 1);
	while (owed.length && owing.length) {
		owed.sort(byLeft);
		owing.sort(byLeft);
		const to = owed[0]!;
		const from = owing[0]!;
		const amount = Math.min(to.left, from.left);
		out.push({ from: from.name, to: to.name, amountMinor: amount });
		to.left -= amount;
		from.left -= amount;
		if (to.left === 0) owed.shift();
		if (from.left === 0) owing.shift();
	}
	return out;
}
