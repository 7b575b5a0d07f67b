import { useSyncExternalStore } from 'react';

const subscribe = () => () => {};

/**
 * False on the server and while the page hydrates, true from the render after: for parts of an
 * island that are costly to render on the server and useless before a script can drive them.
 */
export function useHydrated(): boolean {
	return useSyncExternalStore(
		subscribe,
		() => true,
		() => false,
	);
}
