import type { ReactNode } from 'react';

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="flex flex-col items-center gap-2 px-4 py-10 text-center">
      <svg aria-hidden="true" viewBox="0 0 48 48" className="size-12 text-ink-300" fill="none" stroke="currentColor" strokeWidth="2">
        <rect x="8" y="6" width="32" height="36" rx="3" />
        <path d="M16 16h16M16 24h16M16 32h9" strokeLinecap="round" />
      </svg>
      <p className="font-semibold text-ink-800">{title}</p>
      {children && <div className="max-w-md text-sm text-ink-600">{children}</div>}
      {action}
    </div>
  );
}
