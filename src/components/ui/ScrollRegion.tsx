import type { ReactNode } from 'react';

/**
 * A box that scrolls sideways when its table is wider than the screen (a phone): a named region a
 * keyboard can reach and scroll with the arrow keys, with a visible focus ring.
 */
export function ScrollRegion({
	label,
	className = '',
	children,
}: {
	/** What the region holds, for screen readers ("Runs", "Cable checks"). */
	label: string;
	className?: string;
	children: ReactNode;
}) {
	return (
		<div
			role="region"
			aria-label={label}
			tabIndex={0}
			className={`overflow-x-auto focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-copper ${className}`}
		>
			{children}
		</div>
	);
}
