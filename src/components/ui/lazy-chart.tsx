import {
	type ComponentType,
	lazy,
	type ReactNode,
	Suspense,
	useEffect,
	useRef,
	useState,
} from 'react';

/**
 * Renders `children` once its place comes within a screen's reach of the viewport; until then an
 * empty box of the chart's size holds the layout. No IntersectionObserver (an old browser, a
 * test's DOM): at once.
 */
function WhenNearScreen({
	placeholder,
	children,
}: {
	placeholder: ReactNode;
	children: ReactNode;
}) {
	const ref = useRef<HTMLDivElement>(null);
	const [near, setNear] = useState(false);
	useEffect(() => {
		const el = ref.current;
		if (!el || typeof IntersectionObserver === 'undefined') {
			setNear(true);
			return;
		}
		const io = new IntersectionObserver(
			(entries) => {
				if (entries.some((e) => e.isIntersecting)) {
					setNear(true);
					io.disconnect();
				}
			},
			{ rootMargin: '400px 0px' },
		);
		io.observe(el);
		return () => io.disconnect();
	}, []);
	return near ? children : <div ref={ref}>{placeholder}</div>;
}

/**
 * A chart component whose module (and Chart.js with it) loads only when the chart is about to be
 * on screen: pages that show no chart, or show it far down, do not pay for Chart.js up front.
 * `className` sizes the placeholder as the chart will be (e.g. `h-64`).
 */
export function lazyChart<P extends object>(
	load: () => Promise<ComponentType<P>>,
	className: string,
): ComponentType<P> {
	const Lazy = lazy(async () => ({ default: await load() }));
	function LazyChart(props: P) {
		const placeholder = (
			<div className={`${className} rounded-md bg-paper/60`} aria-busy="true">
				<span className="sr-only">Drawing the chart…</span>
			</div>
		);
		return (
			<WhenNearScreen placeholder={placeholder}>
				<Suspense fallback={placeholder}>
					<Lazy {...props} />
				</Suspense>
			</WhenNearScreen>
		);
	}
	return LazyChart;
}
