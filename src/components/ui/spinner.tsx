import { cx } from '@/lib/cx';

/** A turning ring; with a label it is announced as a status. */
export function Spinner({ size = 'md', label = 'Loading…', className }: { size?: 'sm' | 'md' | 'lg'; label?: string; className?: string }) {
  const dims = size === 'sm' ? 'size-4 border-2' : size === 'lg' ? 'size-10 border-4' : 'size-6 border-2';
  const ring = <span aria-hidden="true" className={cx('inline-block animate-spin rounded-full border-current border-r-transparent', dims, className)} />;
  if (!label) return ring;
  return (
    <span role="status" className="inline-flex items-center gap-2">
      {ring}
      <span className="sr-only">{label}</span>
    </span>
  );
}

export function FullPageSpinner({ label = 'Loading Fieldproof…' }: { label?: string }) {
  return (
    <div className="flex min-h-[60vh] items-center justify-center text-ink-600">
      <Spinner size="lg" label={label} />
    </div>
  );
}
