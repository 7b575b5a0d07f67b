import { ApiError } from '@/lib/client/api-client';
import { FormMessage } from '@/components/ui/Field';

export function ErrorNote({ error }: { error: unknown }) {
	if (!error) return null;
	return (
		<FormMessage tone="error">
			{error instanceof ApiError ? error.message : 'Something went wrong. Try again.'}
		</FormMessage>
	);
}
