import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useForm } from 'react-hook-form';
import { describe, expect, it } from 'vitest';
import type { PostalCodeLookup } from '@shared/schemas/admin';
import { renderWithRouter } from '@/testing/render';
import { AgencyFields, type AgencyFieldValues } from './agency-fields';

function Harness({ lookup }: { lookup: (code: string) => Promise<PostalCodeLookup | null> }) {
  const { register, formState, getValues, setValue, watch } = useForm<AgencyFieldValues>({ defaultValues: { name: 'A', timeZone: 'America/Chicago' } });
  return (
    <form aria-label="Harness">
      <AgencyFields register={register} errors={formState.errors} getValues={getValues} setValue={setValue} lookupPostalCode={lookup} />
      <output aria-label="Coordinates">{`${watch('latitude') ?? ''},${watch('longitude') ?? ''}`}</output>
    </form>
  );
}

describe('AgencyFields (the agency form and the agency profile share it)', () => {
  it('asks the caller’s look-up for the postal code and fills the coordinates, city and region', async () => {
    const asked: string[] = [];
    renderWithRouter(<Harness lookup={async (code) => (asked.push(code), { postalCode: code, city: 'Testville', region: 'TS', country: 'US', latitude: 40.5, longitude: -90.25 })} />);
    await userEvent.type(screen.getByLabelText('Postal code'), '00001');
    await userEvent.click(screen.getByRole('button', { name: 'Look up' }));
    await waitFor(() => expect(screen.getByLabelText('Coordinates').textContent).toBe('40.5,-90.25'));
    expect(asked).toEqual(['00001']);
    expect((screen.getByLabelText('City') as HTMLInputElement).value).toBe('Testville');
    expect(screen.getByText(/Coordinates set to the centre of 00001/)).toBeTruthy();
  });

  it('says when the postal code is unknown', async () => {
    renderWithRouter(<Harness lookup={async () => null} />);
    await userEvent.type(screen.getByLabelText('Postal code'), '99999');
    await userEvent.click(screen.getByRole('button', { name: 'Look up' }));
    expect(await screen.findByText(/not in the lookup table/)).toBeTruthy();
  });
});
