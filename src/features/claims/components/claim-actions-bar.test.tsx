import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { ClaimAction } from '@shared/permissions/ability';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderWithRouter } from '@/testing/render';
import { ClaimActionsBar } from './claim-actions-bar';

function claimWith(allowedActions: string[], over: Partial<ClaimDetail> = {}): ClaimDetail {
  return {
    id: 'claim-1',
    number: 'T-0001',
    state: 'in_review',
    agencyId: 'org-agency-a',
    agencyName: 'Test Agency A',
    technicianId: 'user-technician',
    technicianName: 'Test technician',
    serial: 'SN-1',
    modelNumber: 'MODEL-1',
    siteName: 'Test Site',
    failureDate: '2026-01-02',
    repairDate: '2026-01-03',
    submittedAt: '2026-01-04T10:00:00.000Z',
    createdAt: '2026-01-03T10:00:00.000Z',
    claimedTotalCents: 10000,
    approvedTotalCents: null,
    currency: 'USD',
    flags: [],
    version: 7,
    complaint: 'c',
    cause: 'c',
    correction: 'c',
    preAuthorization: null,
    resubmissionCount: 0,
    firstSubmittedAt: '2026-01-04T10:00:00.000Z',
    decidedAt: null,
    paidAt: null,
    reviewerName: null,
    unit: null,
    site: null,
    laborLines: [],
    travel: null,
    partLines: [],
    readings: [],
    attachments: [],
    events: [],
    comments: [],
    allowedActions,
    ...over,
  };
}

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

const buttonNames = () =>
  within(screen.getByRole('group', { name: 'Actions' }))
    .getAllByRole('button')
    .map((b) => b.textContent);

describe('ClaimActionsBar', () => {
  it.each<[string[], string[]]>([
    [['submit', 'withdraw'], ['Submit', 'Withdraw']],
    [['start_review'], ['Start review']],
    [['approve', 'return', 'deny'], ['Approve', 'Return to agency', 'Deny']],
    [['return', 'deny'], ['Return to agency', 'Deny']],
    [['withdraw'], ['Withdraw']],
  ])('renders exactly the allowed actions %j, whatever the role', (allowed, labels) => {
    // A reviewer's session with a technician's moves: the bar follows the claim, not the role.
    renderWithRouter(<ClaimActionsBar claim={claimWith(allowed)} />, { me: meFor(allowed.includes('submit') ? 'reviewer' : 'technician') });
    expect(buttonNames()).toEqual(labels);
  });

  it('renders nothing when no move is allowed, and never offers pay', () => {
    const { container } = renderWithRouter(<ClaimActionsBar claim={claimWith(['pay'])} />, { me: meFor('accountant') });
    expect(screen.queryByRole('group', { name: 'Actions' })).not.toBeInTheDocument();
    expect(container.querySelectorAll('button')).toHaveLength(0);
  });

  it('shows only the moves it is asked for among the allowed ones', () => {
    renderWithRouter(<ClaimActionsBar claim={claimWith(['submit', 'withdraw'])} only={['withdraw', 'approve']} />, { me: meFor('technician') });
    expect(buttonNames()).toEqual(['Withdraw']);
  });

  it('returns a claim only with a reason and a comment, sending the version it saw', async () => {
    fake = installFakeFetch((c) => (c.method === 'POST' && c.url.pathname === '/api/claims/claim-1/transitions' ? json(claimWith([], { state: 'returned', version: 8 })) : undefined));
    const onMoved = vi.fn();
    renderWithRouter(<ClaimActionsBar claim={claimWith(['approve', 'return', 'deny'])} onMoved={onMoved} />, { me: meFor('reviewer') });
    const user = userEvent.setup();
    await user.click(screen.getByRole('button', { name: 'Return to agency' }));
    const dialog = screen.getByRole('form', { name: 'Return to the agency' });
    await user.click(within(dialog).getByRole('button', { name: 'Return to agency' }));
    expect(await within(dialog).findByText('Choose a reason.')).toBeInTheDocument();
    expect(within(dialog).getByText('Write a comment.')).toBeInTheDocument();
    expect(within(dialog).getByLabelText('Reason')).toHaveAttribute('aria-invalid', 'true');
    expect(fake.calls.filter((c) => c.method === 'POST')).toHaveLength(0);

    // A reason alone is not enough.
    await user.selectOptions(within(dialog).getByLabelText('Reason'), 'missing_evidence');
    await user.click(within(dialog).getByRole('button', { name: 'Return to agency' }));
    expect(await within(dialog).findByText('Write a comment.')).toBeInTheDocument();
    expect(fake.calls.filter((c) => c.method === 'POST')).toHaveLength(0);

    // Deny-only reasons are not offered for a return.
    const options = within(within(dialog).getByLabelText('Reason')).getAllByRole('option').map((o) => (o as HTMLOptionElement).value);
    expect(options).not.toContain('outside_coverage');
    expect(options).toContain('labor_over_guide');

    await user.type(within(dialog).getByLabelText('Comment for the agency'), 'The serial plate photo is missing.');
    await user.click(within(dialog).getByRole('button', { name: 'Return to agency' }));
    await waitFor(() => expect(onMoved).toHaveBeenCalled());
    const posts = fake.calls.filter((c) => c.method === 'POST');
    expect(posts).toHaveLength(1);
    expect(posts[0].body).toEqual({ type: 'return', version: 7, reason: 'missing_evidence', comment: 'The serial plate photo is missing.' });
    expect(onMoved.mock.calls[0][1]).toBe('return' satisfies ClaimAction);
  });

  it('says someone else changed the claim on a 409 and reloads it', async () => {
    fake = installFakeFetch((c) => {
      if (c.method === 'POST') return json({ error: { code: 'stale_version', message: 'Someone changed this claim since you opened it.' } }, { status: 409 });
      if (c.url.pathname === '/api/claims/claim-1') return json(claimWith([], { state: 'in_review', version: 9 }));
      return undefined;
    });
    const { queryClient } = renderWithRouter(<ClaimActionsBar claim={claimWith(['start_review'], { state: 'submitted' })} />, { me: meFor('reviewer') });
    queryClient.setQueryData(['claims', 'detail', 'claim-1'], claimWith(['start_review'], { state: 'submitted' }));
    await userEvent.setup().click(screen.getByRole('button', { name: 'Start review' }));
    expect(await screen.findByText('Someone else changed this claim')).toBeInTheDocument();
    expect(fake.calls.find((c) => c.method === 'POST')?.body).toEqual({ type: 'start_review', version: 7 });
    expect(queryClient.getQueryState(['claims', 'detail', 'claim-1'])?.isInvalidated).toBe(true);
  });
});
