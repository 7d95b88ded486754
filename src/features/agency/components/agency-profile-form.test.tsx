import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import type { AgencyProfile } from '@shared/schemas/admin';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { meFor, renderWithRouter } from '@/testing/render';
import { AgencyProfileForm } from './agency-profile-form';

const profile: AgencyProfile = {
  id: 'org-agency-a',
  name: 'Test Agency A',
  contactEmail: null,
  addressLine: null,
  city: null,
  region: null,
  postalCode: null,
  country: 'US',
  latitude: null,
  longitude: null,
  timeZone: 'America/Chicago',
  active: true,
  updatedAt: '2026-01-01T00:00:00.000Z',
};

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

describe('AgencyProfileForm with the shared name schema', () => {
  it('refuses a text-direction override in the name beside the field, without sending', async () => {
    fake = installFakeFetch();
    renderWithRouter(<AgencyProfileForm profile={profile} />, { me: meFor('agency_admin') });
    const name = screen.getByLabelText('Agency name');
    await userEvent.clear(name);
    await userEvent.type(name, 'Test \u202EAgency');
    await userEvent.click(screen.getByRole('button', { name: 'Save the profile' }));
    expect(await screen.findByText('The agency name cannot contain text-direction control characters.')).toBeTruthy();
    expect(fake.calls.filter((c) => c.method === 'PATCH')).toHaveLength(0);
  });

  it('sends a valid name in NFC, trimmed, and shows the server’s message for a taken name on the field', async () => {
    fake = installFakeFetch((c) =>
      c.method === 'PATCH' && c.url.pathname === '/api/agency/profile'
        ? json({ error: { code: 'validation_failed', message: 'Some fields need attention.', fields: { name: 'Another service agency already uses this name.' } } }, { status: 400 })
        : undefined,
    );
    renderWithRouter(<AgencyProfileForm profile={profile} />, { me: meFor('agency_admin') });
    const name = screen.getByLabelText('Agency name');
    await userEvent.clear(name);
    await userEvent.type(name, '  Cafe\u0301 Repair  ');
    await userEvent.click(screen.getByRole('button', { name: 'Save the profile' }));
    expect(await screen.findByText('Another service agency already uses this name.')).toBeTruthy();
    await waitFor(() => expect(fake!.calls.find((c) => c.method === 'PATCH')?.body).toMatchObject({ name: 'Caf\u00e9 Repair' }));
  });
});

describe('AgencyProfileForm rename', () => {
  it('puts the new name into the session at once, so the header shows it without a reload', async () => {
    fake = installFakeFetch((c) =>
      c.method === 'PATCH' && c.url.pathname === '/api/agency/profile'
        ? json({ ...profile, name: 'Test Agency Renamed' })
        : c.url.pathname === '/api/auth/me'
          ? json({ ...meFor('agency_admin'), organisation: { ...meFor('agency_admin').organisation, name: 'Test Agency Renamed' } })
          : undefined,
    );
    const { queryClient } = renderWithRouter(<AgencyProfileForm profile={profile} />, { me: meFor('agency_admin') });
    const name = screen.getByLabelText('Agency name');
    await userEvent.clear(name);
    await userEvent.type(name, 'Test Agency Renamed');
    await userEvent.click(screen.getByRole('button', { name: 'Save the profile' }));
    expect(await screen.findByText('The agency profile is saved.')).toBeTruthy();
    expect(queryClient.getQueryData<{ organisation: { name: string } }>(['auth', 'me'])?.organisation.name).toBe('Test Agency Renamed');
  });
});
