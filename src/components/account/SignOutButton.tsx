import { useState } from 'react';
import { signOut } from '@/lib/client/auth-client';

export function SignOutButton() {
	const [busy, setBusy] = useState(false);
	return (
		<button
			type="button"
			onClick={() => {
				setBusy(true);
				void signOut('/');
			}}
			disabled={busy}
			className="rounded-md border border-paper/30 px-3 py-1 text-sm text-paper hover:border-paper"
		>
			{busy ? 'Signing out…' : 'Sign out'}
		</button>
	);
}
