import type { ReactNode } from 'react';

import { fmt } from '@/lib/format';
import { Button } from '@/components/ui/Field';
import { installQuestion } from '@/lib/client/install-plan';

/** A signed figure ("+0.42"), or a dash when there is none. */
export const signed = (x: number | null, digits = 2) =>
	x === null ? '—' : `${x > 0 ? '+' : ''}${fmt(x, digits)}`;

export function Row({
	label,
	hint,
	children,
}: {
	label: string;
	hint?: string;
	children: React.ReactNode;
}) {
	return (
		<tr className="border-t border-hairline">
			<th scope="row" className="bg-paper/60 px-3 py-2 text-left font-semibold">
				{label}
				{hint && <span className="block text-xs font-normal text-ink-soft">{hint}</span>}
			</th>
			{children}
		</tr>
	);
}

export function cell(key: string, content: React.ReactNode, tone = '') {
	return (
		<td key={key} className={`num px-3 py-2 text-right ${tone}`}>
			{content}
		</td>
	);
}

export function InstallButton({
	name,
	dangers,
	busy,
	disabled,
	onConfirm,
}: {
	name: string;
	/** Danger findings the plan brings: named in the question, so nobody installs one unawares. */
	dangers: string[];
	busy: boolean;
	disabled: boolean;
	onConfirm: () => void;
}) {
	return (
		<Button
			variant="secondary"
			busy={busy}
			disabled={disabled}
			className="px-3 py-1 text-xs"
			onClick={() => {
				if (window.confirm(installQuestion(name, dangers))) onConfirm();
			}}
		>
			Install as next revision
		</Button>
	);
}

/** How an amplifier's own burp voltage moved against the current build, in words and an arrow. */
export function VoltageTrend({ changeV }: { changeV: number | null }) {
	if (changeV === null) return null;
	if (Math.abs(changeV) < 0.005)
		return <span className="font-semibold whitespace-nowrap">= same voltage ·</span>;
	const better = changeV > 0;
	return (
		<span
			className={`font-semibold whitespace-nowrap ${better ? 'text-teal' : 'text-brick'}`}
			title="This amplifier's burp voltage against the current build"
		>
			{better ? '▲' : '▼'} {signed(changeV)} V, {better ? 'better' : 'worse'} ·
		</span>
	);
}

/** A column's findings of one kind: "✓ none", or their count opening onto the list. */
export function FindingsCell({ items }: { items: ReactNode[] }) {
	return (
		<td className="px-3 py-2 text-right align-top">
			{items.length === 0 ? (
				<span className="text-teal">✓ none</span>
			) : (
				<details>
					<summary className="cursor-pointer text-amber-text">⚠ {items.length}</summary>
					<ul className="mt-1 space-y-1 text-left text-xs">
						{items.map((item, i) => (
							<li key={i}>{item}</li>
						))}
					</ul>
				</details>
			)}
		</td>
	);
}
