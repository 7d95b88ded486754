import { reasonLabel } from '@shared/workflow/reason-codes';
import { formatDateTime } from '@/lib/format';

export interface ReturnInfo {
  reason: string | null;
  comment: string | null;
  actorName: string | null;
  at: string;
}

/** The reviewer's reason and comment, beside the fields it concerns. */
export function ReviewerNote({ info, compact = false }: { info: ReturnInfo; compact?: boolean }) {
  return (
    <div role="note" aria-label="Reviewer’s note" className="rounded-md border-l-4 border-brass-400 bg-brass-50 px-3 py-2 text-sm text-ink-900">
      <p className="font-semibold text-brass-700">Reviewer: {reasonLabel(info.reason) || 'Returned'}</p>
      {info.comment && <p className="mt-0.5 whitespace-pre-line">{info.comment}</p>}
      {!compact && (
        <p className="mt-1 text-xs text-ink-600">
          {info.actorName ?? 'Reviewer'} · {formatDateTime(info.at)}
        </p>
      )}
    </div>
  );
}
