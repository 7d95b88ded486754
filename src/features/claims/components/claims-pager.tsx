import { Button } from '@/components/ui/button';

export interface ClaimsPagerProps {
  /** 1-based; null when the page was opened from a link and earlier pages are unknown. */
  pageNumber: number | null;
  pageSize: number;
  shown: number;
  total: number;
  hasPrevious: boolean;
  hasNext: boolean;
  onPrevious: () => void;
  onNext: () => void;
  busy?: boolean;
}

export function ClaimsPager({ pageNumber, pageSize, shown, total, hasPrevious, hasNext, onPrevious, onNext, busy }: ClaimsPagerProps) {
  const first = pageNumber ? (pageNumber - 1) * pageSize + 1 : null;
  const range = shown === 0 ? 'No claims' : first ? `Claims ${first.toLocaleString('en-US')}–${(first + shown - 1).toLocaleString('en-US')}` : `${shown} claims`;
  return (
    <nav aria-label="Pages of claims" className="flex flex-wrap items-center justify-between gap-3 border-t border-ink-100 px-4 py-3">
      <p className="text-sm text-ink-700" aria-live="polite">
        {range} of {total.toLocaleString('en-US')}
        {pageNumber && total > pageSize && <span className="text-ink-500"> · page {pageNumber} of {Math.max(1, Math.ceil(total / pageSize))}</span>}
      </p>
      <div className="flex gap-2">
        <Button variant="secondary" size="sm" onClick={onPrevious} disabled={!hasPrevious || busy}>
          <span aria-hidden="true">←</span> Previous
        </Button>
        <Button variant="secondary" size="sm" onClick={onNext} disabled={!hasNext || busy}>
          Next <span aria-hidden="true">→</span>
        </Button>
      </div>
    </nav>
  );
}
