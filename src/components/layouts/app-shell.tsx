import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { Link, useLocation, useNavigation } from 'react-router';
import { roleLabels, type AppAbility, type Role } from '@shared/permissions/ability';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';
import { cx } from '@/lib/cx';
import { Button, buttonClass } from '@/components/ui/button';
import { BrandMark } from './brand-mark';

export interface NavItem {
  key: string;
  label: string;
  to: string;
  allowed: (ability: AppAbility) => boolean;
  isActive: (pathname: string, search: URLSearchParams) => boolean;
}

/** What each role may use, read from its CASL ability, never from the role name. */
export const navItems: NavItem[] = [
  { key: 'home', label: 'Home', to: paths.home, allowed: () => true, isActive: (p) => p === paths.home },
  {
    key: 'claims',
    label: 'Claims',
    to: paths.claims,
    allowed: (a) => a.can('read', 'Claim'),
    isActive: (p, s) => p.startsWith(paths.claims) && !(p === paths.claims && s.get('state') === 'submitted'),
  },
  {
    key: 'review',
    label: 'Review queue',
    to: paths.reviewQueue,
    allowed: (a) => a.can('start_review', 'Claim'),
    isActive: (p, s) => p.startsWith(paths.reviewQueue) || (p === paths.claims && s.get('state') === 'submitted'),
  },
  { key: 'payment-runs', label: 'Payment runs', to: paths.paymentRuns, allowed: (a) => a.can('read', 'PaymentRun'), isActive: (p) => p.startsWith(paths.paymentRuns) },
  // Every user may read their own record; managing users is what invite marks.
  { key: 'users', label: 'Users', to: paths.users, allowed: (a) => a.can('invite', 'User'), isActive: (p) => p.startsWith(paths.users) },
  { key: 'catalogue', label: 'Catalogue', to: paths.catalogue, allowed: (a) => a.can('manage', 'Catalog'), isActive: (p) => p.startsWith(paths.catalogue) },
  { key: 'agencies', label: 'Agencies', to: paths.agencies, allowed: (a) => a.can('create', 'Agency'), isActive: (p) => p.startsWith(paths.agencies) },
];

export interface AppShellProps {
  user: { name: string; role: Role };
  organisation: { name: string };
  onSignOut: () => void;
  signingOut?: boolean;
  children: ReactNode;
}

export function AppShell({ user, organisation, onSignOut, signingOut = false, children }: AppShellProps) {
  const ability = useAppAbility();
  const location = useLocation();
  const navigation = useNavigation();
  const [menuOpen, setMenuOpen] = useState(false);
  const menuId = useId();
  const mainRef = useRef<HTMLElement>(null);
  const firstPath = useRef(location.pathname);
  const search = new URLSearchParams(location.search);
  const items = navItems.filter((item) => item.allowed(ability));
  const busy = navigation.state === 'loading';

  // A new page moves focus to the content, so a screen reader starts there, not in the header.
  useEffect(() => {
    setMenuOpen(false);
    if (location.pathname !== firstPath.current) {
      firstPath.current = location.pathname;
      mainRef.current?.focus({ preventScroll: true });
    }
  }, [location.pathname]);

  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="skip-link">
        Skip to content
      </a>
      <div aria-hidden="true" className={cx('fixed inset-x-0 top-0 z-40 h-0.5 bg-brass-400 transition-opacity', busy ? 'animate-pulse opacity-100' : 'opacity-0')} />
      <header className="bg-ink-800 text-white">
        <div className="mx-auto flex max-w-7xl items-center gap-3 px-4 py-3">
          <Link to={paths.home} className="flex items-center gap-2 rounded-md">
            <BrandMark className="size-7" />
            <span className="text-lg font-bold tracking-tight">Fieldproof</span>
          </Link>
          <span className="hidden truncate border-l border-ink-600 pl-3 text-sm text-ink-100 sm:inline">{organisation.name}</span>
          <div className="ml-auto flex items-center gap-3">
            <p className="hidden text-right text-sm leading-tight md:block">
              <span className="block font-medium">{user.name}</span>
              <span className="block text-ink-200">{roleLabels[user.role] ?? user.role}</span>
            </p>
            <div className="hidden items-center gap-2 md:flex">
              <Link to={paths.accountSecurity} className={buttonClass('inverse', 'sm', 'inline-flex items-center')} aria-current={location.pathname === paths.accountSecurity ? 'page' : undefined}>
                Security
              </Link>
              <Button variant="inverse" size="sm" onClick={onSignOut} pending={signingOut}>
                Sign out
              </Button>
            </div>
            <button
              type="button"
              className="inline-flex min-h-10 items-center gap-2 rounded-md border border-ink-500 px-3 text-sm md:hidden"
              aria-expanded={menuOpen}
              aria-controls={menuId}
              onClick={() => setMenuOpen((o) => !o)}
            >
              <svg aria-hidden="true" viewBox="0 0 20 20" className="size-4" fill="none" stroke="currentColor" strokeWidth="2">
                {menuOpen ? <path d="M5 5l10 10M15 5L5 15" strokeLinecap="round" /> : <path d="M3 6h14M3 10h14M3 14h14" strokeLinecap="round" />}
              </svg>
              Menu
            </button>
          </div>
        </div>
        <nav id={menuId} aria-label="Main" className={cx('border-t border-ink-700 bg-ink-900/30 md:block', menuOpen ? 'block' : 'hidden')}>
          <ul className="mx-auto flex max-w-7xl flex-col gap-1 px-2 py-2 md:flex-row md:px-4 md:py-0">
            {items.map((item) => {
              const active = item.isActive(location.pathname, search);
              return (
                <li key={item.key}>
                  <Link
                    to={item.to}
                    aria-current={active ? 'page' : undefined}
                    className={cx(
                      'block rounded-md px-3 py-2.5 text-sm font-medium md:rounded-none md:border-b-2 md:px-3 md:py-3',
                      active ? 'bg-ink-700 text-white md:border-brass-300 md:bg-transparent' : 'text-ink-100 hover:bg-ink-700 md:border-transparent md:hover:bg-transparent md:hover:text-white',
                    )}
                  >
                    {item.label}
                  </Link>
                </li>
              );
            })}
          </ul>
          <div className="border-t border-ink-700 px-4 py-3 md:hidden">
            <p className="text-sm">
              <span className="font-medium">{user.name}</span> · <span className="text-ink-200">{roleLabels[user.role] ?? user.role}</span>
            </p>
            <p className="text-sm text-ink-200">{organisation.name}</p>
            <div className="mt-2 flex flex-wrap gap-2">
              <Link to={paths.accountSecurity} className={buttonClass('inverse', 'sm', 'inline-flex items-center')} aria-current={location.pathname === paths.accountSecurity ? 'page' : undefined}>
                Security
              </Link>
              <Button variant="inverse" size="sm" onClick={onSignOut} pending={signingOut}>
                Sign out
              </Button>
            </div>
          </div>
        </nav>
      </header>
      <main id="main" ref={mainRef} tabIndex={-1} aria-busy={busy || undefined} className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 focus:outline-none">
        {children}
      </main>
      <footer className="border-t border-ink-100 px-4 py-4 text-sm text-ink-600">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-2">
          <span>Fieldproof</span>
          <Link to={paths.mailbox} className="underline underline-offset-2 hover:text-ink-900">
            Mailbox
          </Link>
        </div>
      </footer>
    </div>
  );
}
