import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { CatalogModel, CatalogRepairCode } from '@shared/schemas/catalog';
import { installFakeFetch, json, type FakeCall } from '@/testing/fake-fetch';
import { meFor, renderWithRouter } from '@/testing/render';
import { ClaimEditor } from './claim-editor';

const repairCode: CatalogRepairCode = { id: 'rc-1', code: 'RC-10', description: 'Test repair', familyId: 'fam-1', familyCode: 'FAM', allowedHours: 1, requiredEvidence: [], active: true };
const model: CatalogModel = {
  id: 'model-1',
  modelNumber: 'MODEL-1',
  name: 'Test model',
  family: { id: 'fam-1', code: 'FAM', name: 'Test family', fuel: 'electric' },
  partsMonths: 12,
  laborMonths: 12,
  capMonthsFromShip: 18,
  installGraceDays: 30,
  active: true,
  readingSpecs: [],
  componentTerms: [],
};

function draft(over: Partial<ClaimDetail> = {}): ClaimDetail {
  return {
    id: 'claim-1',
    number: 'T-0001',
    state: 'draft',
    agencyId: 'org-agency-a',
    agencyName: 'Test Agency A',
    technicianId: 'user-technician',
    technicianName: 'Test technician',
    serial: 'SN-1',
    modelNumber: 'MODEL-1',
    siteName: null,
    failureDate: '2026-01-02',
    repairDate: '2026-01-03',
    submittedAt: null,
    createdAt: '2026-01-03T10:00:00.000Z',
    claimedTotalCents: 0,
    approvedTotalCents: null,
    currency: 'USD',
    flags: [],
    version: 3,
    complaint: 'Does not heat.',
    cause: '',
    correction: '',
    preAuthorization: null,
    resubmissionCount: 0,
    firstSubmittedAt: null,
    decidedAt: null,
    paidAt: null,
    reviewerName: null,
    unit: { id: 'unit-1', serial: 'SN-1', revision: 'A', shipDate: '2025-06-01', installDate: '2025-07-01', model: { id: 'model-1', modelNumber: 'MODEL-1', name: 'Test model', familyId: 'fam-1', familyName: 'Test family' }, terms: { basis: 'ship', basisDate: '2025-06-01', effectiveFrom: '0001-01-01', partsMonths: 12, laborMonths: 12, capMonthsFromShip: 18, installGraceDays: 90, componentTerms: [] } },
    site: null,
    laborLines: [{ id: 'l-1', position: 1, repairCodeId: 'rc-1', repairCode: 'RC-10', description: 'Test repair', allowedHours: 1, hoursWorked: 1, overtime: false, note: '', approvedHours: null, adjustmentReason: null, approvedAmountCents: null }],
    travel: null,
    partLines: [],
    readings: [],
    attachments: [],
    events: [],
    comments: [],
    allowedActions: ['withdraw'],
    ...over,
  };
}

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

function catalogAnd(patch: (c: FakeCall) => Response | undefined, claim?: ClaimDetail) {
  return installFakeFetch((c) => {
    const p = c.url.pathname;
    if (claim && c.method === 'GET' && p === '/api/claims/claim-1') return json(claim);
    if (p === '/api/catalog/repair-codes') return json({ items: [repairCode] });
    if (p === '/api/catalog/parts') return json({ items: [] });
    if (p === '/api/catalog/models') return json({ items: [model] });
    if (p === '/api/claims/claim-1/valuation-input') return json({ claimId: 'claim-1', version: 3, input: null, problems: [{ path: 'repairDate', message: 'No contract terms.' }] });
    if (c.method === 'PATCH' && p === '/api/claims/claim-1') return patch(c);
    return undefined;
  });
}

function renderEditor(claim = draft()) {
  const view = renderWithRouter(
    <ClaimEditor claim={claim} renderValuation={() => <p>valuation</p>} submitClaim={() => Promise.reject(new Error('not in this test'))} onSubmitted={() => undefined} />,
    { me: meFor('technician') },
  );
  view.queryClient.setQueryData(['claims', 'detail', claim.id], claim);
  return view;
}

const patches = () => fake!.calls.filter((c) => c.method === 'PATCH');

describe('ClaimEditor autosave', () => {
  it('saves only the changed field with the version it holds, and shows when', async () => {
    fake = catalogAnd(() => json(draft({ version: 4, cause: 'Element open.' })));
    renderEditor();
    const user = userEvent.setup();
    await user.type(screen.getByLabelText('Cause'), 'Element open.');
    await waitFor(() => expect(patches()).toHaveLength(1), { timeout: 4000 });
    expect(patches()[0].body).toEqual({ version: 3, cause: 'Element open.' });
    expect(await screen.findByText(/^Saved ·/)).toBeInTheDocument();
  });

  it('puts the server’s field errors on their fields', async () => {
    fake = catalogAnd(() =>
      json(
        { error: { code: 'validation_failed', message: 'Some fields need attention.', fields: { 'laborLines.0.repairCodeId': 'This repair code is for another product family than the unit.', correction: 'Say what you replaced.' } } },
        { status: 400 },
      ),
    );
    renderEditor();
    const user = userEvent.setup();
    const line = await screen.findByRole('listitem', { name: 'Labor line 1' });
    const hours = within(line).getByLabelText('Hours worked');
    await user.clear(hours);
    await user.type(hours, '1.5');
    await user.type(screen.getByLabelText('Correction'), 'Replaced it.');
    await waitFor(() => expect(patches().length).toBeGreaterThan(0), { timeout: 4000 });

    const code = within(line).getByLabelText('Repair code');
    await waitFor(() => expect(code).toHaveAttribute('aria-invalid', 'true'));
    expect(code).toHaveAccessibleDescription(/another product family than the unit/);
    const correction = screen.getByLabelText('Correction');
    expect(correction).toHaveAttribute('aria-invalid', 'true');
    expect(correction).toHaveAccessibleDescription(/Say what you replaced\./);
    // The untouched field stays clean, and the status says the save did not go through.
    expect(screen.getByLabelText('Cause')).not.toHaveAttribute('aria-invalid');
    expect(screen.getByText(/Not saved yet/)).toBeInTheDocument();
  });

  it('refuses hours "1,5" in an en-US browser with a message, and never saves them as 15', async () => {
    fake = catalogAnd(() => json(draft({ version: 4 })));
    renderEditor();
    const user = userEvent.setup();
    const line = await screen.findByRole('listitem', { name: 'Labor line 1' });
    const hours = within(line).getByLabelText('Hours worked');
    await user.clear(hours);
    await user.type(hours, '1,5');
    await user.tab();
    await waitFor(() => expect(hours).toHaveAttribute('aria-invalid', 'true'), { timeout: 4000 });
    expect(hours).toHaveAccessibleDescription(/point for decimals/);
    for (const c of patches()) expect(JSON.stringify(c.body)).not.toMatch(/"hoursWorked":15\b/);
  });

  it('on a stale version reloads the latest claim into the form and says so', async () => {
    const latest = draft({ version: 9, complaint: 'Changed in another tab.' });
    let first = true;
    fake = catalogAnd(() => {
      if (!first) return json(draft({ version: 10, complaint: latest.complaint, cause: 'y' }));
      first = false;
      return json({ error: { code: 'stale_version', message: 'Someone changed this claim since you opened it.' } }, { status: 409 });
    }, latest);
    renderEditor();
    const user = userEvent.setup();
    await user.type(screen.getByLabelText('Cause'), 'x');
    expect(await screen.findByText('The claim changed elsewhere', undefined, { timeout: 5000 })).toBeInTheDocument();
    await waitFor(() => expect(screen.getByLabelText('Complaint')).toHaveValue('Changed in another tab.'));
    expect(screen.getByLabelText('Cause')).toHaveValue('');
    expect(patches()[0].body).toMatchObject({ version: 3 });

    // The next save carries the reloaded version.
    await user.type(screen.getByLabelText('Cause'), 'y');
    await waitFor(() => expect(patches()).toHaveLength(2), { timeout: 4000 });
    expect(patches()[1].body).toEqual({ version: 9, cause: 'y' });
  });

  it('lists every problem of the submission check, each a link to its field', async () => {
    fake = catalogAnd(() => json(draft({ version: 4 })));
    renderEditor(draft({ cause: '', correction: '', failureDate: null }));
    const check = await screen.findByRole('region', { name: 'Check and submit' });
    const links = within(check).getAllByRole('link').map((a) => a.textContent);
    expect(links).toEqual(['Enter the failure date.', 'Describe the cause you found.', 'Describe the correction you made.']);
    expect(within(check).getByRole('button', { name: 'Submit the claim' })).toBeDisabled();
    await userEvent.setup().click(within(check).getByRole('link', { name: 'Describe the cause you found.' }));
    expect(screen.getByLabelText('Cause')).toHaveFocus();
  });

  it('adds a labor line without marking it wrong before it is touched, and removes it', async () => {
    fake = catalogAnd(() => json(draft({ version: 4 })));
    renderEditor();
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Add a labor line' }));
    const added = await screen.findByRole('listitem', { name: 'Labor line 2' });
    expect(within(added).getByLabelText('Repair code')).toHaveFocus();
    expect(within(added).queryByText('Choose a repair code.')).not.toBeInTheDocument();
    expect(within(added).getByLabelText('Hours worked')).not.toHaveAttribute('aria-invalid');
    await user.click(within(added).getByRole('button', { name: 'Remove line 2' }));
    expect(screen.queryByRole('listitem', { name: 'Labor line 2' })).not.toBeInTheDocument();
    expect(screen.getByRole('listitem', { name: 'Labor line 1' })).toBeInTheDocument();
  });
});
