import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { cx } from '@/lib/cx';
import type { SaveState } from '../hooks/use-autosave';

const time = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });

const words: Record<string, string> = {
  complaint: 'complaint',
  cause: 'cause',
  correction: 'correction',
  failureDate: 'failure date',
  repairDate: 'repair date',
  preAuthorization: 'pre-authorisation number',
  laborLines: 'labor',
  travel: 'travel',
  partLines: 'parts',
  readings: 'readings',
};
const fieldWords = (f: string) => words[f.split('.')[0]] ?? f.split('.')[0];

/** Where the draft stands against the server, in a few words, with a retry when a save failed. */
export function SaveStatus({ state, onRetry, className }: { state: SaveState; onRetry: () => void; className?: string }) {
  let body;
  switch (state.status) {
    case 'idle':
      body = <span className="text-ink-700">All changes saved</span>;
      break;
    case 'pending':
    case 'saving':
      body = (
        <span className="inline-flex items-center gap-2 text-ink-700">
          <Spinner size="sm" label="" /> Saving…
        </span>
      );
      break;
    case 'saved':
      body = (
        <span className="inline-flex items-center gap-1.5 text-emerald-800">
          <svg aria-hidden="true" viewBox="0 0 20 20" className="size-4" fill="none" stroke="currentColor" strokeWidth="2.5">
            <path d="m4 10.5 4 4 8-9" strokeLinecap="round" strokeLinejoin="round" />
          </svg>
          Saved · <time dateTime={state.at.toISOString()}>{time.format(state.at)}</time>
        </span>
      );
      break;
    case 'invalid':
      body = (
        <span className="text-brass-700">
          Not saved yet: {[...new Set(state.fields.map(fieldWords))].join(', ')} incomplete
          {state.at ? ` · the rest saved ${time.format(state.at)}` : ''}
        </span>
      );
      break;
    case 'failed':
      body = (
        <span className="inline-flex flex-wrap items-center gap-2 text-red-800">
          <span>Not saved — {state.message}</span>
          <Button size="sm" variant="secondary" onClick={onRetry}>
            Retry
          </Button>
        </span>
      );
      break;
  }
  return (
    <p role="status" aria-live="polite" className={cx('text-sm font-medium', className)}>
      {body}
    </p>
  );
}
