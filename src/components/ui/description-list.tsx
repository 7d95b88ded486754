import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

/** Label/value pairs; a missing value shows a dash so a gap never reads as an error. */
export function DescriptionList({ items, className }: { items: Array<{ label: string; value: ReactNode }>; className?: string }) {
  return (
    <dl className={cx('grid grid-cols-[minmax(7rem,auto)_1fr] gap-x-4 gap-y-2 text-sm', className)}>
      {items.map((item) => (
        <div key={item.label} className="contents">
          <dt className="text-ink-600">{item.label}</dt>
          <dd className="text-ink-900">{item.value === null || item.value === undefined || item.value === '' ? '—' : item.value}</dd>
        </div>
      ))}
    </dl>
  );
}
