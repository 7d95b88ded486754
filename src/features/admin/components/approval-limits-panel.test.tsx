import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { renderWithRouter } from '@/testing/render';
import { ApprovalLimitsPanel, limitToCents } from './approval-limits-panel';

describe('ApprovalLimitsPanel', () => {
  it('reads a limit strictly as dollars and cents', () => {
    expect(limitToCents('2500')).toBe(250_000);
    expect(limitToCents('2500.5')).toBe(250_050);
    expect(limitToCents('')).toBeNull();
    expect(limitToCents('1,5')).toBeUndefined();
    expect(limitToCents('12..5')).toBeUndefined();
    expect(limitToCents('-1')).toBeUndefined();
  });

  it('saves a reviewer’s limit in cents', async () => {
    const fetch = installFakeFetch((c) => {
      if (c.method === 'GET' && c.url.pathname === '/api/admin/approval-limits') return json({ items: [{ userId: 'u1', name: 'A reviewer', email: 'r@x.test', limitCents: null }] });
      if (c.method === 'PATCH' && c.url.pathname === '/api/admin/approval-limits/u1') return json({ userId: 'u1', name: 'A reviewer', email: 'r@x.test', limitCents: 250_000 });
      return undefined;
    });
    try {
      const user = userEvent.setup();
      renderWithRouter(<ApprovalLimitsPanel />);
      await user.type(await screen.findByLabelText('Approval limit for A reviewer ($)'), '2500');
      await user.click(screen.getByRole('button', { name: 'Save limit' }));
      await waitFor(() => expect(fetch.calls.some((c) => c.method === 'PATCH')).toBe(true));
      expect(fetch.calls.find((c) => c.method === 'PATCH')!.body).toEqual({ limitCents: 250_000 });
    } finally {
      fetch.restore();
    }
  });
});
