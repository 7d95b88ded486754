import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { Role } from '@shared/permissions/ability';
import { meFor, renderWithRouter } from '@/testing/render';
import { AppShell } from './app-shell';

function renderShell(role: Role, path = '/') {
  const me = meFor(role);
  const onSignOut = vi.fn();
  renderWithRouter(
    <AppShell user={me.user} organisation={me.organisation} onSignOut={onSignOut}>
      <p>content</p>
    </AppShell>,
    { me, path },
  );
  return { onSignOut };
}

function navLabels(): string[] {
  const nav = screen.getByRole('navigation', { name: 'Main' });
  // the sections of the app; the account's own links (security, sign out) sit apart
  return within(within(nav).getAllByRole('list')[0]!)
    .getAllByRole('link')
    .map((a) => a.textContent ?? '');
}

describe('AppShell navigation', () => {
  it.each<[Role, string[]]>([
    ['technician', ['Home', 'Claims']],
    ['agency_admin', ['Home', 'Claims', 'Payment runs', 'Users']],
    ['reviewer', ['Home', 'Claims', 'Review queue']],
    ['accountant', ['Home', 'Claims', 'Payment runs']],
    ['manufacturer_admin', ['Home', 'Users', 'Catalogue', 'Agencies']],
  ])('shows a %s only what the ability allows', (role, expected) => {
    renderShell(role);
    expect(navLabels()).toEqual(expected);
  });

  it('shows nothing beyond Home to a session without rules', () => {
    const me = meFor('technician');
    renderWithRouter(
      <AppShell user={me.user} organisation={me.organisation} onSignOut={() => {}}>
        <p>content</p>
      </AppShell>,
      { me: { ...me, rules: [] } },
    );
    expect(navLabels()).toEqual(['Home']);
  });

  it('names the product, the organisation, the user and the role, and keeps the mailbox in the footer', () => {
    renderShell('reviewer');
    const banner = screen.getByRole('banner');
    expect(within(banner).getByText('Fieldproof')).toBeInTheDocument();
    expect(within(banner).getAllByText('Test Maker').length).toBeGreaterThan(0);
    expect(within(banner).getAllByText('Test reviewer').length).toBeGreaterThan(0);
    expect(within(banner).getAllByText('Warranty reviewer').length).toBeGreaterThan(0);
    expect(within(screen.getByRole('contentinfo')).getByRole('link', { name: 'Mailbox' })).toHaveAttribute('href', '/dev/mailbox');
    expect(within(screen.getByRole('navigation', { name: 'Main' })).queryByRole('link', { name: 'Mailbox' })).not.toBeInTheDocument();
  });

  it('marks the review queue, not the claim list, as the current page on /claims?state=submitted', () => {
    renderShell('reviewer', '/claims?state=submitted');
    const nav = screen.getByRole('navigation', { name: 'Main' });
    expect(within(nav).getByRole('link', { name: 'Review queue' })).toHaveAttribute('aria-current', 'page');
    expect(within(nav).getByRole('link', { name: 'Claims' })).not.toHaveAttribute('aria-current');
  });

  it('opens the menu on a phone with a button that reports its state, and signs out', async () => {
    const { onSignOut } = renderShell('technician');
    const user = userEvent.setup();
    const toggle = screen.getByRole('button', { name: 'Menu' });
    expect(toggle).toHaveAttribute('aria-expanded', 'false');
    await user.click(toggle);
    expect(toggle).toHaveAttribute('aria-expanded', 'true');
    await user.click(screen.getAllByRole('button', { name: 'Sign out' })[0]);
    expect(onSignOut).toHaveBeenCalledTimes(1);
  });

  it.each<Role>(['technician', 'agency_admin', 'reviewer', 'accountant', 'manufacturer_admin'])('gives a %s a link to the account security page', (role) => {
    renderShell(role);
    const links = screen.getAllByRole('link', { name: 'Security' });
    expect(links.length).toBeGreaterThan(0);
    for (const a of links) expect(a).toHaveAttribute('href', '/account/security');
  });
});
