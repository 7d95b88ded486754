import { render, screen } from '@testing-library/react';
import { MemoryRouter } from 'react-router';
import type { HomeCard as HomeCardData } from '@shared/schemas/home';
import type { ClaimListItem } from '@shared/schemas/claim';
import { HomeCard } from './home-card';

const item = (over: Partial<ClaimListItem> = {}): ClaimListItem => ({
  id: 'c1',
  number: 'FP-2026-000001',
  state: 'approved',
  agencyId: 'a1',
  agencyName: 'Agency',
  technicianId: 't1',
  technicianName: 'Tech',
  serial: 'S1',
  modelNumber: 'M1',
  siteName: null,
  failureDate: '2026-06-01',
  repairDate: '2026-06-02',
  submittedAt: '2026-06-03T10:00:00.000Z',
  createdAt: '2026-06-02T10:00:00.000Z',
  claimedTotalCents: 29144,
  approvedTotalCents: 31594,
  currency: 'USD',
  flags: [],
  ...over,
});

const card = (over: Partial<HomeCardData>): HomeCardData => ({ key: 'k', label: 'Label', hint: 'Hint', count: 0, items: [], href: '/claims', tone: 'info', kind: 'queue', amount: 'allowed', ...over });

const renderCard = (c: HomeCardData) => render(<MemoryRouter><HomeCard card={c} now={new Date('2026-06-15T12:00:00Z')} /></MemoryRouter>);

describe('HomeCard', () => {
  it('shows the approved amount on a queue of approved claims, not the amount the rules allowed', () => {
    renderCard(card({ count: 1, items: [item()], amount: 'approved' }));
    expect(screen.getByText('$315.94')).toBeInTheDocument();
    expect(screen.queryByText('$291.44')).toBeNull();
  });

  it('shows the allowed amount on a queue of claims not yet decided', () => {
    renderCard(card({ count: 1, items: [item({ state: 'submitted', approvedTotalCents: null })] }));
    expect(screen.getByText('$291.44')).toBeInTheDocument();
  });

  it('never says "Nothing waiting" beside a count above zero', () => {
    renderCard(card({ kind: 'count', count: 1 }));
    expect(screen.getByText('1')).toBeInTheDocument();
    expect(screen.queryByText(/nothing waiting/i)).toBeNull();
    expect(screen.queryByText(/none yet/i)).toBeNull();
  });

  it('says "Nothing waiting" on an empty queue and "None yet" on a zero count', () => {
    const { unmount } = renderCard(card({ count: 0 }));
    expect(screen.getByText('Nothing waiting.')).toBeInTheDocument();
    unmount();
    renderCard(card({ kind: 'count', count: 0 }));
    expect(screen.getByText('None yet.')).toBeInTheDocument();
  });
});

describe('HomeCard drafts', () => {
  it('shows the days left to file on a draft, and that the window has passed on a late one', () => {
    renderCard(
      card({
        count: 3,
        tone: 'action',
        items: [
          item({ id: 'd1', number: 'FP-2026-000011', state: 'draft', approvedTotalCents: null, filing: { lastDay: '2026-06-20', daysLeft: 5, late: false } }),
          item({ id: 'd2', number: 'FP-2026-000012', state: 'draft', approvedTotalCents: null, filing: { lastDay: '2026-06-15', daysLeft: 0, late: false } }),
          item({ id: 'd3', number: 'FP-2026-000013', state: 'draft', approvedTotalCents: null, filing: { lastDay: '2026-06-10', daysLeft: -5, late: true } }),
        ],
      }),
    );
    expect(screen.getByText('5 days left to file')).toBeInTheDocument();
    expect(screen.getByText('Last day to file')).toBeInTheDocument();
    expect(screen.getByText('Filing window passed on 2026-06-10')).toBeInTheDocument();
  });
});
