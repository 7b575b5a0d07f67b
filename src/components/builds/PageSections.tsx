import { useCallback, useEffect, useId, useState } from 'react';

/** The workbench's sections, in page order: the in-page navigation lists them, each a target. */
export const WORKBENCH_SECTIONS = [
	{ id: 'findings', title: 'Findings' },
	{ id: 'upgrades', title: 'Upgrades' },
	{ id: 'network', title: 'Network' },
	{ id: 'supply', title: 'Demand and supply' },
	{ id: 'session', title: 'Session' },
	{ id: 'speed', title: 'Speed' },
	{ id: 'heating', title: 'Heating' },
	{ id: 'parts', title: 'Parts' },
] as const;
export type SectionId = (typeof WORKBENCH_SECTIONS)[number]['id'];
export type Collapsed = Exclude<SectionId, 'findings' | 'upgrades'>;

/**
 * Which sections a page opens by default. The build page opens on the state of the system and the
 * next step (about three screens at 1366×768); the rest start closed until the member opens them,
 * which this browser then remembers. A plan page is for editing: everything starts open.
 */
const DEFAULTS: Record<'build' | 'plan', Record<Collapsed, boolean>> = {
	build: {
		network: true,
		supply: false,
		session: false,
		speed: false,
		heating: false,
		parts: false,
	},
	plan: { network: true, supply: true, session: true, speed: true, heating: true, parts: true },
};

export const sectionDomId = (id: SectionId) => `section-${id}`;
const storageKey = (page: 'build' | 'plan') => `sagwise.sections.${page}`;

function kept(page: 'build' | 'plan'): Partial<Record<Collapsed, unknown>> | null {
	try {
		const v: unknown = JSON.parse(localStorage.getItem(storageKey(page)) ?? 'null');
		return v && typeof v === 'object' ? (v as Partial<Record<Collapsed, unknown>>) : null;
	} catch {
		return null;
	}
}

function keep(page: 'build' | 'plan', open: Record<Collapsed, boolean>) {
	try {
		localStorage.setItem(storageKey(page), JSON.stringify(open));
	} catch {
		// Storage full or refused (a private window): the sections still open, just not remembered.
	}
}

/**
 * Open and closed sections, remembered per browser (a layout choice, not anyone's data). The first
 * render is the page's default, the same on the server and in the browser; what the member opened
 * before follows once the page is live, and a link to a section (#section-…) opens it.
 */
export function useOpenSections(page: 'build' | 'plan') {
	const [open, setOpen] = useState<Record<Collapsed, boolean>>(DEFAULTS[page]);
	useEffect(() => {
		const stored = kept(page);
		const hashed = WORKBENCH_SECTIONS.find((s) => `#${sectionDomId(s.id)}` === location.hash)?.id;
		const next = { ...DEFAULTS[page] };
		for (const id of Object.keys(next) as Collapsed[])
			if (typeof stored?.[id] === 'boolean') next[id] = stored[id] as boolean;
		if (hashed && hashed in next) next[hashed as Collapsed] = true;
		setOpen(next);
		if (hashed)
			requestAnimationFrame(() => scrollToSection(hashed, { focus: false, smooth: false }));
	}, [page]);
	const set = useCallback(
		(id: Collapsed, value: boolean) =>
			setOpen((o) => {
				const next = { ...o, [id]: value };
				keep(page, next);
				return next;
			}),
		[page],
	);
	return { open, set };
}

/** Where a section's heading comes to rest: just under the sticky summary. */
function restingTop(el: HTMLElement) {
	const strip = document.querySelector('[data-summary]')?.getBoundingClientRect().height ?? 0;
	return el.getBoundingClientRect().top + window.scrollY - strip - 8;
}

/**
 * Brings a section's heading just under the sticky summary and moves focus to it. Figures still
 * arriving above it (the ranked upgrades, a chart) would push it down: for a moment it follows
 * them, until the member scrolls on their own.
 */
export function scrollToSection(
	id: SectionId,
	{ focus = true, smooth = true }: { focus?: boolean; smooth?: boolean } = {},
) {
	const el = document.getElementById(sectionDomId(id));
	if (!el) return;
	const reduce = matchMedia('(prefers-reduced-motion: reduce)').matches;
	window.scrollTo({ top: restingTop(el), behavior: smooth && !reduce ? 'smooth' : 'auto' });
	if (focus) el.querySelector<HTMLElement>('[data-section-focus]')?.focus({ preventScroll: true });
	history.replaceState(history.state, '', `#${sectionDomId(id)}`);
	let target = restingTop(el);
	let mine = true;
	const stop = () => (mine = false);
	const events = ['wheel', 'touchstart', 'keydown', 'pointerdown'] as const;
	for (const e of events) window.addEventListener(e, stop, { once: true, passive: true });
	const until = performance.now() + 2000;
	const follow = () => {
		if (!mine || performance.now() > until) {
			for (const e of events) window.removeEventListener(e, stop);
			return;
		}
		const now = restingTop(el);
		if (Math.abs(now - target) > 4) {
			target = now;
			window.scrollTo({ top: now, behavior: 'auto' });
		}
		requestAnimationFrame(follow);
	};
	requestAnimationFrame(follow);
}

/**
 * The in-page navigation, in the sticky summary so it stays at hand: a link per section; one to a
 * closed section opens it first.
 */
export function SectionNav({ onOpen }: { onOpen: (id: SectionId) => void }) {
	return (
		<nav aria-label="Sections of the page" className="mt-1 -mx-gutter overflow-x-auto px-gutter">
			<ul className="flex gap-1 text-xs whitespace-nowrap">
				{WORKBENCH_SECTIONS.map((s) => (
					<li key={s.id}>
						<a
							href={`#${sectionDomId(s.id)}`}
							className="inline-block rounded px-2 py-1 font-semibold text-ink-soft hover:bg-copper-tint hover:text-ink"
							onClick={(e) => {
								e.preventDefault();
								onOpen(s.id);
								// After React has rendered the opened section.
								requestAnimationFrame(() => requestAnimationFrame(() => scrollToSection(s.id)));
							}}
						>
							{s.title}
						</a>
					</li>
				))}
			</ul>
		</nav>
	);
}

/**
 * A section of the page that opens and closes by its heading (a disclosure button inside the h2):
 * closed, its body is not rendered at all, so a closed chart or table costs nothing.
 */
export function PageSection({
	id,
	title,
	note,
	open,
	onToggle,
	children,
}: {
	id: Collapsed;
	title: string;
	/** One line beside the heading saying what is inside (shown open or closed). */
	note?: React.ReactNode;
	open: boolean;
	onToggle: (open: boolean) => void;
	children: React.ReactNode;
}) {
	const bodyId = useId();
	const headingId = `${sectionDomId(id)}-heading`;
	return (
		<section id={sectionDomId(id)} aria-labelledby={headingId} className="flex flex-col gap-4">
			<h2 id={headingId} className="text-xl font-bold">
				<button
					type="button"
					aria-expanded={open}
					aria-controls={bodyId}
					data-section-focus
					onClick={() => onToggle(!open)}
					className="flex w-full items-baseline gap-2 rounded border-b border-hairline pb-1 text-left hover:text-copper-text"
				>
					<span
						aria-hidden="true"
						className={`inline-block w-4 transition-transform ${open ? 'rotate-90' : ''}`}
					>
						▸
					</span>
					<span>{title}</span>
					{note && <span className="truncate text-sm font-normal text-ink-soft">{note}</span>}
				</button>
			</h2>
			<div id={bodyId} hidden={!open} className="flex flex-col gap-8">
				{open && children}
			</div>
		</section>
	);
}
