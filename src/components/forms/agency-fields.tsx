import { useState } from 'react';
import type { UseFormGetValues, UseFormRegister, UseFormSetValue, FieldErrors } from 'react-hook-form';
import { commonTimeZones } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { errorMessage } from '@/lib/api-client';
import type { PostalCodeLookup } from '@shared/schemas/admin';

export interface AgencyFieldValues {
  name?: string;
  contactEmail?: string | null;
  addressLine?: string | null;
  city?: string | null;
  region?: string | null;
  postalCode?: string | null;
  latitude?: number | null;
  longitude?: number | null;
  timeZone?: string;
}

const blankToNull = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? null : v);
const toNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/**
 * Name, contact and base of an agency, with the postal-code look-up that fills the coordinates:
 * the manufacturer admin's agency form and the agency's own profile both use it.
 */
export function AgencyFields<T extends AgencyFieldValues>({
  register,
  errors,
  getValues,
  setValue,
  currentTimeZone,
  lookupPostalCode,
  coordinateHint = { latitude: 'Empty: from the postal code', longitude: 'Empty: from the postal code' },
}: {
  register: UseFormRegister<T>;
  errors: FieldErrors<T>;
  getValues: UseFormGetValues<T>;
  setValue: UseFormSetValue<T>;
  currentTimeZone?: string;
  /** The caller's look-up operation (each feature keeps its own API file). */
  lookupPostalCode: (code: string) => Promise<PostalCodeLookup | null>;
  coordinateHint?: { latitude: string; longitude: string };
}) {
  // The generic form is narrowed to the shared fields here.
  const reg = register as unknown as UseFormRegister<AgencyFieldValues>;
  const err = errors as FieldErrors<AgencyFieldValues>;
  const get = getValues as unknown as UseFormGetValues<AgencyFieldValues>;
  const set = setValue as unknown as UseFormSetValue<AgencyFieldValues>;
  const [note, setNote] = useState<{ tone: 'info' | 'warning'; text: string } | null>(null);
  const [looking, setLooking] = useState(false);

  const lookUp = async () => {
    const code = String(get('postalCode') ?? '').trim();
    if (!code) return setNote({ tone: 'warning', text: 'Enter a postal code first.' });
    setLooking(true);
    try {
      const hit = await lookupPostalCode(code);
      if (!hit) return setNote({ tone: 'warning', text: 'That postal code is not in the lookup table. Enter the latitude and longitude by hand.' });
      set('latitude', hit.latitude, { shouldDirty: true });
      set('longitude', hit.longitude, { shouldDirty: true });
      if (!get('city')) set('city', hit.city, { shouldDirty: true });
      if (!get('region')) set('region', hit.region, { shouldDirty: true });
      setNote({ tone: 'info', text: `Coordinates set to the centre of ${hit.postalCode} (${hit.city}, ${hit.region}). Correct them by hand if the base is elsewhere.` });
    } catch (e) {
      setNote({ tone: 'warning', text: errorMessage(e) });
    } finally {
      setLooking(false);
    }
  };

  return (
    <div className="space-y-4">
      {note && <Alert tone={note.tone}>{note.text}</Alert>}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Agency name" error={err.name?.message}>
          {(p) => <Input {...p} {...reg('name')} />}
        </Field>
        <Field label="Contact e-mail" error={err.contactEmail?.message}>
          {(p) => <Input {...p} type="email" {...reg('contactEmail')} />}
        </Field>
      </div>
      <Field label="Base address" error={err.addressLine?.message}>
        {(p) => <Input {...p} autoComplete="street-address" {...reg('addressLine')} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="City" error={err.city?.message}>
          {(p) => <Input {...p} {...reg('city')} />}
        </Field>
        <Field label="State or province" error={err.region?.message}>
          {(p) => <Input {...p} {...reg('region')} />}
        </Field>
        <Field label="Postal code" error={err.postalCode?.message}>
          {(p) => (
            <div className="flex gap-2">
              <Input {...p} autoComplete="postal-code" {...reg('postalCode', { setValueAs: blankToNull })} />
              <Button variant="secondary" onClick={lookUp} pending={looking}>
                Look up
              </Button>
            </div>
          )}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Latitude" hint={coordinateHint.latitude} error={err.latitude?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...reg('latitude', { setValueAs: toNumber })} />}
        </Field>
        <Field label="Longitude" hint={coordinateHint.longitude} error={err.longitude?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...reg('longitude', { setValueAs: toNumber })} />}
        </Field>
        <Field label="Time zone" error={err.timeZone?.message}>
          {(p) => (
            <Select {...p} {...reg('timeZone')}>
              {[...new Set([...(currentTimeZone ? [currentTimeZone] : []), ...commonTimeZones])].map((tz) => (
                <option key={tz} value={tz}>
                  {tz.replace('_', ' ')}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
    </div>
  );
}
