import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { UnitLookup } from '@shared/schemas/unit';
import { computeCoverage } from '@shared/calculations/coverage';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderWithRouter } from '@/testing/render';
import { NewClaimFlow } from './new-claim-flow';

const lookup: UnitLookup = {
  unit: { id: 'unit-1', serial: 'SN-TEST-1', revision: 'A', shipDate: '2026-01-05', installDate: '2026-01-20' },
  model: { id: 'model-1', modelNumber: 'MODEL-1', name: 'Test model', partsMonths: 24, laborMonths: 12, capMonthsFromShip: 30, installGraceDays: 90 },
  family: { id: 'fam-1', code: 'FAM', name: 'Test family', fuel: 'gas' },
  site: null,
  on: '2026-06-01',
  coverage: computeCoverage({ failureDate: '2026-06-01', shipDate: '2026-01-05', installDate: '2026-01-20', terms: { partsMonths: 24, laborMonths: 12, capMonthsFromShip: 30, installGraceDays: 90 } }),
  priorClaims: [],
  terms: { basis: 'ship', basisDate: '2026-01-05', effectiveFrom: '0001-01-01', partsMonths: 24, laborMonths: 12, capMonthsFromShip: 30, installGraceDays: 90, componentTerms: [] },
};

describe('NewClaimFlow', () => {
  it('sends one Idempotency-Key per intended start, the same on a double click, and disables the button while pending', async () => {
    let release: (() => void) | null = null;
    const fetch = installFakeFetch((c) => {
      if (c.method === 'GET' && c.url.pathname.startsWith('/api/units/')) return json(lookup);
      if (c.method === 'POST' && c.url.pathname === '/api/claims') {
        return new Promise<Response>((resolve) => {
          release = () => resolve(json({ error: { code: 'x', message: 'Try again.' } }, { status: 503 }));
        });
      }
      return undefined;
    });
    try {
      const user = userEvent.setup();
      renderWithRouter(<NewClaimFlow onCreated={() => {}} />, { me: meFor('technician') });
      await user.type(screen.getByLabelText('Serial number'), 'SN-TEST-1');
      const button = await screen.findByRole('button', { name: /start the claim for this unit/i }, { timeout: 3000 });
      await user.dblClick(button);
      await waitFor(() => expect(button).toBeDisabled());
      const posts = () => fetch.calls.filter((c) => c.method === 'POST');
      expect(posts()).toHaveLength(1);
      const key = new Headers(posts()[0]!.init?.headers).get('Idempotency-Key');
      expect(key).toMatch(/^"[0-9a-f-]{32,36}"$/);
      release!();
      await waitFor(() => expect(button).not.toBeDisabled());
      await user.click(button);
      await waitFor(() => expect(posts()).toHaveLength(2));
      expect(new Headers(posts()[1]!.init?.headers).get('Idempotency-Key')).toBe(key);
    } finally {
      fetch.restore();
    }
  });
});
