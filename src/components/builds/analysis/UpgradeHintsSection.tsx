import { useContext, useState } from 'react';
import type { BuildDocument, UpgradeHint } from '@/engine/browser';
import { minorToText } from '@/lib/money';
import { dbPer100, shelfCostOf } from '@/lib/shelf-prices';
import type { ShelfItemDto } from '@/lib/shelf-kinds';
import { ShelfContext, ShelfLoader } from '../shelf-context';
import { fmt } from '@/lib/format';
import { Button } from '@/components/ui/Field';
import { Unit } from './ResultTable';

/** Changes shown before "show all": the top of the ranking is the answer to "what next". */
const FIRST_HINTS = 5;

const hintKey = (h: UpgradeHint) => `${h.kind}-${h.targetId}`;

/**
 * Single upgrades, each solved on its own, ranked by the voltage it gives back at the weakest
 * amplifier, with the output in dB it gives back (the figure a plan comparison shows for it). A
 * member can turn any line into a plan that already holds the change.
 */
export function UpgradeHintsSection({
	hints,
	stale = false,
	fromDraft = false,
	onMakePlan,
	before,
}: {
	hints: UpgradeHint[] | null;
	/** The build the changes start from (to price what each adds from the team's shelf). */
	before?: BuildDocument;
	/** The ranking is for an earlier draft; a newer one is being worked out. */
	stale?: boolean;
	/** The draft has unsaved changes: a plan made here carries them too. */
	fromDraft?: boolean;
	/** Makes a plan of a change and answers where it opens (none: the reader cannot make plans). */
	onMakePlan?: (hint: UpgradeHint) => Promise<string>;
}) {
	const [all, setAll] = useState(false);
	const [making, setMaking] = useState<string | null>(null);
	const [failed, setFailed] = useState<{ key: string; message: string } | null>(null);
	const shown = hints ? (all ? hints : hints.slice(0, FIRST_HINTS)) : [];
	const shelf = useContext(ShelfContext);
	const [entries, setEntries] = useState<ShelfItemDto[]>([]);
	// A column for the shelf's price once the shelf has any entry.
	const priced = before !== undefined && entries.length > 0;
	return (
		<section aria-labelledby="section-upgrades-heading" id="section-upgrades">
			{shelf && <ShelfLoader teamId={shelf.teamId} onEntries={setEntries} />}
			<h2 id="section-upgrades-heading" className="text-xl font-bold">
				<span data-section-focus tabIndex={-1}>
					What to change next
				</span>
			</h2>
			<p className="text-sm text-ink-soft">
				One change at a time, each solved on its own, ranked by the volts it gives back at the
				weakest amplifier under the burp (and the output that is in dB).
				{onMakePlan &&
					(fromDraft
						? ' A plan made here starts from your draft, unsaved changes included.'
						: ' A plan made here starts from the saved build with the change already made.')}
			</p>
			{hints === null ? (
				// About as tall as the first five lines, so what is below does not jump when they come.
				<p role="status" className="mt-3 h-52 text-sm text-ink-soft max-sm:h-[26rem]">
					Ranking upgrades…
				</p>
			) : hints.length === 0 ? (
				<p className="mt-2 text-sm text-ink-soft">No amplifier to rank upgrades for.</p>
			) : (
				<>
					<ol
						className={`mt-3 divide-y divide-hairline rounded-md border border-hairline bg-card text-sm ${stale ? 'opacity-70' : ''}`}
						data-upgrades
					>
						{shown.map((h, i) => {
							const key = hintKey(h);
							const cost = priced ? shelfCostOf(before, h, entries) : null;
							const perHundred = cost ? dbPer100(h.gainDb, cost.costMinor) : null;
							return (
								<li
									key={key}
									className={`grid grid-cols-[1.5rem_1fr] items-center gap-x-3 gap-y-1 px-3 py-2 ${priced ? 'sm:grid-cols-[1.5rem_1fr_auto_auto_auto_auto]' : 'sm:grid-cols-[1.5rem_1fr_auto_auto_auto]'}`}
									data-upgrade={h.kind}
								>
									<span className="num text-ink-soft">{i + 1}.</span>
									<span className="min-w-0">{h.description}</span>
									{/* On a phone the figures and the button share one line under the change. */}
									<span className="flex flex-wrap items-center gap-x-3 gap-y-1 max-sm:col-start-2 sm:contents">
										<span
											className={`num font-semibold ${h.gainV > 0.005 ? 'text-teal' : 'text-ink-soft'}`}
										>
											{h.gainV >= 0 ? '+' : ''}
											{fmt(h.gainV, 3)} <Unit>V</Unit>
											<span className="font-normal text-ink-soft">
												{' '}
												→ {fmt(h.afterV)} <Unit>V</Unit>
											</span>
										</span>
										<span className="num" data-gain-db>
											{h.gainDb === null ? (
												<span className="text-ink-soft">dB: collapse</span>
											) : (
												<>
													{h.gainDb >= 0 ? '+' : ''}
													{fmt(h.gainDb, 2)} <Unit>dB</Unit>
												</>
											)}
										</span>
										{priced && (
											<span
												className="num text-xs text-ink-soft"
												data-shelf-cost={cost ? cost.costMinor : undefined}
												title={
													cost
														? `From the shelf: ${cost.quantity} × “${cost.entry.label}”`
														: undefined
												}
											>
												{cost &&
													`${minorToText(cost.costMinor)} from the shelf${perHundred !== null ? ` · ${fmt(perHundred, 2)} dB per 100` : ''}`}
											</span>
										)}
										{onMakePlan && (
											<span>
												<Button
													type="button"
													busy={making === key}
													disabled={making !== null}
													variant="secondary"
													className="px-2! py-1! text-xs"
													aria-label={`Make a plan of this: ${h.description}`}
													onClick={() => {
														setMaking(key);
														setFailed(null);
														onMakePlan(h).then(
															(url) => window.location.assign(url),
															(e: unknown) => {
																setMaking(null);
																setFailed({
																	key,
																	message:
																		e instanceof Error ? e.message : 'Could not make the plan.',
																});
															},
														);
													}}
												>
													Make a plan of this
												</Button>
											</span>
										)}
									</span>
									{failed?.key === key && (
										<p
											role="alert"
											className="text-xs text-brick sm:col-span-full max-sm:col-start-2"
										>
											{failed.message}
										</p>
									)}
								</li>
							);
						})}
					</ol>
					{hints.length > FIRST_HINTS && (
						<button
							type="button"
							className="mt-2 text-sm font-semibold text-teal underline"
							aria-expanded={all}
							onClick={() => setAll(!all)}
						>
							{all ? `Show the first ${FIRST_HINTS}` : `Show all ${hints.length} changes`}
						</button>
					)}
				</>
			)}
		</section>
	);
}
