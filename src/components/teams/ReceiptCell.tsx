import { useId } from 'react';
import { ApiError } from '@/lib/client/api-client';
import { useRemoveReceipt, useUploadReceipt } from '@/lib/client/queries/seasons';
import type { PurchaseDto } from '@/lib/schemas/seasons';

/** A purchase's receipt photo: a link to it, and for members adding, replacing or removing it. */
export function ReceiptCell({
	teamId,
	seasonId,
	purchase: p,
	canEdit,
}: {
	teamId: string;
	seasonId: string;
	purchase: PurchaseDto;
	canEdit: boolean;
}) {
	const inputId = useId();
	const upload = useUploadReceipt(teamId, seasonId);
	const remove = useRemoveReceipt(teamId, seasonId);
	const error = upload.error ?? remove.error;
	return (
		<div
			className="flex flex-wrap items-center gap-x-2 gap-y-1 text-xs"
			data-receipt={p.receiptFileId ? 'yes' : 'no'}
		>
			{p.receiptFileId ? (
				<a
					href={`/api/teams/${teamId}/files/${p.receiptFileId}`}
					target="_blank"
					rel="noopener"
					className="font-semibold text-copper-dark underline"
				>
					Receipt<span className="sr-only"> for {p.item}</span>
				</a>
			) : (
				!canEdit && <span className="text-ink-soft">—</span>
			)}
			{canEdit && (
				<>
					<label
						htmlFor={inputId}
						className="cursor-pointer rounded border border-hairline px-1.5 py-0.5 hover:border-copper focus-within:ring-2 focus-within:ring-copper/30"
					>
						{upload.isPending ? 'Sending…' : p.receiptFileId ? 'Replace' : 'Add receipt'}
						<span className="sr-only"> photo for {p.item}</span>
					</label>
					<input
						id={inputId}
						type="file"
						accept="image/jpeg,image/png,image/webp"
						className="sr-only"
						disabled={upload.isPending}
						onChange={(e) => {
							const file = e.target.files?.[0];
							e.target.value = '';
							if (file) upload.mutate({ purchaseId: p.id, file });
						}}
					/>
					{p.receiptFileId && (
						<button
							type="button"
							className="text-ink-soft underline hover:text-brick"
							disabled={remove.isPending}
							onClick={() => remove.mutate(p.id)}
						>
							Remove<span className="sr-only"> the receipt for {p.item}</span>
						</button>
					)}
				</>
			)}
			{error && (
				<span role="alert" className="basis-full text-brick">
					{error instanceof ApiError ? error.message : 'Could not send it'}
				</span>
			)}
		</div>
	);
}
