import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

export type AlertTone = 'error' | 'warning' | 'info' | 'success';

const tones: Record<AlertTone, string> = {
  error: 'border-red-300 bg-red-50 text-red-900',
  warning: 'border-brass-300 bg-brass-50 text-brass-700',
  info: 'border-ink-200 bg-ink-50 text-ink-800',
  success: 'border-emerald-300 bg-emerald-50 text-emerald-900',
};

/** Errors are announced at once (role="alert"); other notes politely (role="status"). */
export function Alert({ tone = 'info', title, children, className }: { tone?: AlertTone; title?: ReactNode; children?: ReactNode; className?: string }) {
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={cx('rounded-md border px-4 py-3 text-sm', tones[tone], className)}>
      {title && <p className="font-semibold">{title}</p>}
      {children && <div className={title ? 'mt-1' : undefined}>{children}</div>}
    </div>
  );
}
