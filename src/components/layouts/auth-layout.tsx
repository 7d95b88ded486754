import type { ReactNode } from 'react';
import { Link } from 'react-router';
import { paths } from '@/config/paths';
import { BrandMark } from './brand-mark';

/** The signed-out pages: one narrow column, the product name, and the mailbox link in the footer. */
export function AuthLayout({ title, intro, children }: { title: string; intro?: ReactNode; children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="skip-link">
        Skip to content
      </a>
      <header className="px-4 pt-8 sm:pt-16">
        <Link to={paths.home} className="mx-auto flex w-fit items-center gap-2 text-ink-800">
          <BrandMark className="size-8" />
          <span className="text-2xl font-bold tracking-tight">Fieldproof</span>
        </Link>
        <p className="mt-1 text-center text-sm text-ink-600">Warranty claims for foodservice equipment repairs</p>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-md flex-1 px-4 py-8 focus:outline-none">
        <title>{`${title} · Fieldproof`}</title>
        <div className="rounded-lg border border-ink-100 bg-white p-6 shadow-sm sm:p-8">
          <h1 className="text-xl font-semibold text-ink-900">{title}</h1>
          {intro && <div className="mt-1 text-sm text-ink-600">{intro}</div>}
          <div className="mt-6">{children}</div>
        </div>
      </main>
      <footer className="px-4 pb-6 text-center text-sm text-ink-600">
        <Link to={paths.mailbox} className="underline underline-offset-2 hover:text-ink-900">
          Mailbox
        </Link>
      </footer>
    </div>
  );
}
