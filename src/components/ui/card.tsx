import type { HTMLAttributes, ReactNode } from 'react';
import { cx } from '@/lib/cx';

export function Card({ className, ...rest }: HTMLAttributes<HTMLElement>) {
  return <section className={cx('rounded-lg border border-ink-100 bg-white shadow-sm', className)} {...rest} />;
}

export function CardHeader({ title, description, actions, level = 2, id }: { title: ReactNode; description?: ReactNode; actions?: ReactNode; level?: 2 | 3; id?: string }) {
  const H = level === 2 ? 'h2' : 'h3';
  return (
    <header className="flex flex-wrap items-start justify-between gap-2 border-b border-ink-100 px-4 py-3">
      <div>
        <H id={id} className="text-base font-semibold text-ink-900">
          {title}
        </H>
        {description && <p className="text-sm text-ink-600">{description}</p>}
      </div>
      {actions}
    </header>
  );
}

export function CardBody({ className, ...rest }: HTMLAttributes<HTMLDivElement>) {
  return <div className={cx('px-4 py-3', className)} {...rest} />;
}
