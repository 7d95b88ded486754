import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { renderWithRouter } from '@/testing/render';
import { MileageRatesPanel, rateText } from './mileage-rates-panel';

const list = {
  today: '2026-12-02',
  items: [{ id: 'r1', currency: 'USD', unit: 'mi', effectiveFrom: '2026-01-01', effectiveTo: '2026-12-31', rateTenthCents: 725, source: 'A published notice' }],
  noRateToday: ['CAD'],
  gaps: [{ currency: 'USD', from: '2027-01-01', to: null, openClaims: 2 }],
};

describe('MileageRatesPanel', () => {
  it('writes tenths of a cent as cents', () => {
    expect(rateText(725)).toBe('72.5 cents');
    expect(rateText(700)).toBe('70 cents');
  });

  it('lists the rates and warns about days without one', async () => {
    const fetch = installFakeFetch((c) => (c.method === 'GET' && c.url.pathname === '/api/admin/mileage-rates' ? json(list) : undefined));
    try {
      renderWithRouter(<MileageRatesPanel />);
      const table = await screen.findByRole('table', { name: 'Mileage rates' });
      expect(within(table).getByText('72.5 cents per mile')).toBeTruthy();
      expect(screen.getByText(/No CAD rate is in force today/)).toBeTruthy();
      expect(screen.getByText(/2 open claims repaired then cannot be valued/)).toBeTruthy();
    } finally {
      fetch.restore();
    }
  });

  it('adds a rate, sending the cents as typed, and shows the server’s overlap message on the field', async () => {
    const overlap = 'This period overlaps the USD rate of 72.5 cents per mi in force 2026-01-01 to 2026-12-31. End that rate first or choose other dates.';
    const fetch = installFakeFetch((c) => {
      if (c.method === 'GET' && c.url.pathname === '/api/admin/mileage-rates') return json(list);
      if (c.method === 'POST' && c.url.pathname === '/api/admin/mileage-rates') return json({ error: { code: 'overlap', message: overlap, fields: { effectiveFrom: overlap } } }, { status: 409 });
      return undefined;
    });
    try {
      const user = userEvent.setup();
      renderWithRouter(<MileageRatesPanel />);
      await user.click(await screen.findByRole('button', { name: 'New rate' }));
      await user.type(screen.getByLabelText(/First day in force/), '2026-06-01');
      await user.type(screen.getByLabelText(/Rate in cents/), '1,5');
      await user.type(screen.getByLabelText(/^Source/), 'A published notice');
      await user.click(screen.getByRole('button', { name: 'Add the rate' }));
      expect(await screen.findByText(/at most one decimal place, like 72.5/)).toBeTruthy();
      expect(fetch.calls.some((c) => c.method === 'POST')).toBe(false);

      await user.clear(screen.getByLabelText(/Rate in cents/));
      await user.type(screen.getByLabelText(/Rate in cents/), '74.5');
      await user.click(screen.getByRole('button', { name: 'Add the rate' }));
      await waitFor(() => expect(fetch.calls.some((c) => c.method === 'POST')).toBe(true));
      expect(fetch.calls.find((c) => c.method === 'POST')!.body).toEqual({ currency: 'USD', unit: 'mi', effectiveFrom: '2026-06-01', effectiveTo: null, rateCents: '74.5', source: 'A published notice' });
      expect(await screen.findByText(overlap)).toBeTruthy();
    } finally {
      fetch.restore();
    }
  });
});
