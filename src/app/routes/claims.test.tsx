import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { ClaimListItem } from '@shared/schemas/claim';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderRoutes, testQueryClient } from '@/testing/render';
import { ClaimsRoute, claimsLoader } from './claims';

function claim(n: number, over: Partial<ClaimListItem> = {}): ClaimListItem {
  return {
    id: `claim-${n}`,
    number: `T-${String(n).padStart(4, '0')}`,
    state: 'submitted',
    agencyId: 'agency-1',
    agencyName: 'Test Agency A',
    technicianId: 'tech-1',
    technicianName: 'Test Technician',
    serial: `SN-${n}`,
    modelNumber: 'MODEL-1',
    siteName: 'Test Site',
    failureDate: '2026-01-02',
    repairDate: '2026-01-03',
    submittedAt: '2026-01-04T10:00:00.000Z',
    createdAt: '2026-01-03T10:00:00.000Z',
    claimedTotalCents: 123456,
    approvedTotalCents: null,
    currency: 'USD',
    flags: [],
    ...over,
  };
}

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

function fakeClaimsApi() {
  return installFakeFetch((c) => {
    if (c.url.pathname !== '/api/claims') return undefined;
    const cursor = c.url.searchParams.get('cursor');
    if (!cursor) return json({ items: [claim(1), claim(2, { agencyId: 'agency-2', agencyName: 'Test Agency B' })], nextCursor: 'page-2', total: 3 });
    if (cursor === 'page-2') return json({ items: [claim(3, { state: 'approved', approvedTotalCents: 100000 })], nextCursor: null, total: 3 });
    return json({ error: { code: 'bad_cursor', message: 'That page marker is not valid.' } }, { status: 400 });
  });
}

function renderClaims(path = '/claims', role: Parameters<typeof meFor>[0] = 'reviewer') {
  const queryClient = testQueryClient();
  return renderRoutes([{ path: '/claims', loader: claimsLoader(queryClient), Component: ClaimsRoute, HydrateFallback: () => null }], {
    path,
    me: meFor(role),
    queryClient,
  });
}

function claimCalls() {
  return fake!.calls.filter((c) => c.url.pathname === '/api/claims');
}

describe('claim list', () => {
  it('renders the rows of the first page with money from cents in the claim currency', async () => {
    fake = fakeClaimsApi();
    renderClaims();
    const table = await screen.findByRole('table');
    expect(within(table).getByRole('link', { name: 'T-0001' })).toHaveAttribute('href', '/claims/claim-1');
    expect(within(table).getByRole('link', { name: 'T-0002' })).toBeInTheDocument();
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    for (const row of rows) {
      expect(within(row).getByText('$1,234.56')).toBeInTheDocument();
      expect(within(row).getByText('Submitted')).toBeInTheDocument();
    }
    expect(within(table).getByText('Test Agency B')).toBeInTheDocument();
  });

  it('asks for the next page with the cursor the server gave, and comes back with Previous', async () => {
    fake = fakeClaimsApi();
    renderClaims();
    const user = userEvent.setup();
    await screen.findByRole('table');
    expect(screen.getByRole('button', { name: /Previous/ })).toBeDisabled();

    await user.click(screen.getByRole('button', { name: /Next/ }));
    await waitFor(() => expect(within(screen.getByRole('table')).getByRole('link', { name: 'T-0003' })).toBeInTheDocument());
    expect(claimCalls().at(-1)!.url.searchParams.get('cursor')).toBe('page-2');
    expect(screen.getByRole('button', { name: /Next/ })).toBeDisabled();
    expect(screen.getByText(/Claims 26–26 of 3/)).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: /Previous/ }));
    await waitFor(() => expect(within(screen.getByRole('table')).getByRole('link', { name: 'T-0001' })).toBeInTheDocument());
    expect(screen.getByRole('button', { name: /Previous/ })).toBeDisabled();
  });

  it('sends a sortable column’s click to the server as sort and dir', async () => {
    fake = fakeClaimsApi();
    renderClaims();
    const user = userEvent.setup();
    const table = await screen.findByRole('table');
    await user.click(within(table).getByRole('button', { name: /Allowed/ }));
    await waitFor(() => expect(claimCalls().at(-1)!.url.searchParams.get('sort')).toBe('claimedTotalCents'));
    expect(claimCalls().at(-1)!.url.searchParams.get('dir')).toBe('desc');
    await waitFor(() => expect(within(screen.getByRole('table')).getByRole('columnheader', { name: /Allowed/ })).toHaveAttribute('aria-sort', 'descending'));
  });

  it('filters by state and lists the agencies seen for a manufacturer user', async () => {
    fake = fakeClaimsApi();
    renderClaims();
    const user = userEvent.setup();
    await screen.findByRole('table');
    const agency = screen.getByLabelText('Service agency');
    expect(within(agency).getAllByRole('option').map((o) => o.textContent)).toEqual(['All agencies', 'Test Agency A', 'Test Agency B']);
    await user.selectOptions(screen.getByLabelText('State'), 'approved');
    await waitFor(() => expect(claimCalls().at(-1)!.url.searchParams.get('state')).toBe('approved'));
    expect(claimCalls().at(-1)!.url.searchParams.get('cursor')).toBeNull();
  });

  it('offers no agency filter to an agency user', async () => {
    fake = fakeClaimsApi();
    renderClaims('/claims', 'technician');
    await screen.findByRole('table');
    expect(screen.queryByLabelText('Service agency')).not.toBeInTheDocument();
  });

  it('shows the empty state when nothing matches', async () => {
    fake = installFakeFetch((c) => (c.url.pathname === '/api/claims' ? json({ items: [], nextCursor: null, total: 0 }) : undefined));
    renderClaims('/claims?q=nothing', 'technician');
    expect(await screen.findByText('No claims match these filters')).toBeInTheDocument();
    expect(claimCalls()[0].url.searchParams.get('q')).toBe('nothing');
  });

  it('shows the server’s error beside the filters', async () => {
    fake = installFakeFetch((c) => (c.url.pathname === '/api/claims' ? json({ error: { code: 'bad_cursor', message: 'That page marker is not valid.' } }, { status: 400 }) : undefined));
    renderClaims('/claims?cursor=junk', 'technician');
    expect(await screen.findByRole('alert')).toHaveTextContent('That page marker is not valid.');
  });
});
