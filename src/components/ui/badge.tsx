import type { ReactNode } from 'react';
import { cx } from '@/lib/cx';

export type BadgeTone = 'neutral' | 'ink' | 'brass' | 'blue' | 'violet' | 'orange' | 'green' | 'red' | 'slate';

const tones: Record<BadgeTone, string> = {
  neutral: 'bg-stone-100 text-stone-800 ring-stone-300',
  ink: 'bg-ink-100 text-ink-800 ring-ink-300',
  brass: 'bg-brass-100 text-brass-700 ring-brass-300',
  blue: 'bg-sky-100 text-sky-900 ring-sky-300',
  violet: 'bg-violet-100 text-violet-900 ring-violet-300',
  orange: 'bg-orange-100 text-orange-900 ring-orange-300',
  green: 'bg-emerald-100 text-emerald-900 ring-emerald-300',
  red: 'bg-red-100 text-red-900 ring-red-300',
  slate: 'bg-slate-200 text-slate-700 ring-slate-400',
};

export function Badge({ tone = 'neutral', icon, children, className }: { tone?: BadgeTone; icon?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <span className={cx('inline-flex items-center gap-1 whitespace-nowrap rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ring-inset', tones[tone], className)}>
      {icon}
      {children}
    </span>
  );
}
