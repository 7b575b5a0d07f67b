import type { ClientDirective } from 'astro';

/**
 * `client:interact`: the island is server-rendered and usable as HTML, and its script (React with
 * it) loads only when someone reaches for it — a pointer or a key inside it, focus moving into it,
 * or a submit. The click or submit that woke it is not lost: once hydrated, a click is clicked
 * again and a submit is submitted again, on the same elements (hydration keeps the DOM). What was
 * typed meanwhile stays in the fields: the forms start their state from them
 * (src/lib/client/typed-before-hydration.ts) and pick up a file already chosen once hydrated.
 * Pages whose only islands are forms (sign-in, the team list) load no framework until used.
 */
/**
 * Resolves once React has taken over the island's DOM (its hydration runs in a later task than
 * the call that starts it): a hydrated element carries React's own properties. Gives up after two
 * seconds, the way a slow device would still be served.
 */
function attached(el: HTMLElement): Promise<void> {
	const live = () => {
		const first = el.firstElementChild;
		return !!first && Object.keys(first).some((k) => k.startsWith('__react'));
	};
	return new Promise((resolve) => {
		const started = performance.now();
		const check = () => {
			if (live() || performance.now() - started > 2000) resolve();
			else setTimeout(check, 10);
		};
		check();
	});
}

const interact: ClientDirective = (load, _options, el) => {
	const events = [
		'pointerdown',
		'focusin',
		'keydown',
		'click',
		'submit',
		'input',
		'change',
	] as const;
	let started = false;
	let replay: (() => void) | null = null;
	const wake = async (event: Event) => {
		const target = event.target as HTMLElement | null;
		// A button's or a link's click (and a submit) is held until the island is live, then done
		// again; a field's own click (a file chooser, a checkbox) goes ahead natively.
		const held =
			event.type === 'submit' ||
			(event.type === 'click' && !!target?.closest('button, a, [role="button"], [role="radio"]'));
		if (held) {
			event.preventDefault();
			if (event.type === 'submit') {
				const form = target as HTMLFormElement;
				const submitter = (event as SubmitEvent).submitter;
				replay = () => form.requestSubmit(submitter ?? undefined);
			} else {
				const button = target!.closest<HTMLElement>('button, a, [role="button"], [role="radio"]')!;
				replay = () => button.click();
			}
		}
		if (started) return;
		started = true;
		const hydrate = await load();
		await hydrate();
		await attached(el);
		for (const type of events) el.removeEventListener(type, wake, true);
		const again = replay;
		replay = null;
		again?.();
	};
	for (const type of events) el.addEventListener(type, wake, true);
};

export default interact;
