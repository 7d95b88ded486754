import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { agencyProfileSchema, commonTimeZones, type AgencyProfile } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { errorMessage } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { useUpdateAgencyProfile } from '../api/update-agency-profile';
import { lookupPostalCode } from '../api/lookup-postal-code';

type Values = z.input<typeof agencyProfileSchema>;
const fieldNames = ['name', 'contactEmail', 'addressLine', 'city', 'region', 'postalCode', 'latitude', 'longitude', 'timeZone'] as const;
const blankToNull = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? null : v);
const toNumber = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** The agency's name, contact and base (travel is measured from the base coordinates). */
export function AgencyProfileForm({ profile }: { profile: AgencyProfile }) {
  const save = useUpdateAgencyProfile();
  const [formError, setFormError] = useState<string | null>(null);
  const [note, setNote] = useState<{ tone: 'success' | 'warning' | 'info'; text: string } | null>(null);
  const [looking, setLooking] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    getValues,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof agencyProfileSchema>>({
    resolver: zodResolver(agencyProfileSchema),
    defaultValues: {
      name: profile.name,
      contactEmail: profile.contactEmail ?? '',
      addressLine: profile.addressLine ?? '',
      city: profile.city ?? '',
      region: profile.region ?? '',
      postalCode: profile.postalCode ?? '',
      latitude: profile.latitude,
      longitude: profile.longitude,
      timeZone: profile.timeZone,
    },
  });

  const lookUp = async () => {
    const code = String(getValues('postalCode') ?? '').trim();
    if (!code) {
      setNote({ tone: 'warning', text: 'Enter a postal code first.' });
      return;
    }
    setLooking(true);
    try {
      const hit = await lookupPostalCode(code);
      if (!hit) {
        setNote({ tone: 'warning', text: 'That postal code is not in the lookup table. Enter the latitude and longitude by hand.' });
        return;
      }
      setValue('latitude', hit.latitude, { shouldDirty: true });
      setValue('longitude', hit.longitude, { shouldDirty: true });
      if (!getValues('city')) setValue('city', hit.city, { shouldDirty: true });
      if (!getValues('region')) setValue('region', hit.region, { shouldDirty: true });
      setNote({ tone: 'info', text: `Coordinates set to the centre of ${hit.postalCode} (${hit.city}, ${hit.region}). Correct them by hand if the base is elsewhere.` });
    } catch (e) {
      setNote({ tone: 'warning', text: errorMessage(e) });
    } finally {
      setLooking(false);
    }
  };

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    setNote(null);
    save.mutate(values, {
      onSuccess: () => setNote({ tone: 'success', text: 'The agency profile is saved.' }),
      onError: (e) => setFormError(applyServerErrors(e, setError, fieldNames)),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Agency profile">
      {formError && <Alert tone="error">{formError}</Alert>}
      {note && <Alert tone={note.tone}>{note.text}</Alert>}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Agency name" error={errors.name?.message}>
          {(p) => <Input {...p} {...register('name')} />}
        </Field>
        <Field label="Contact e-mail" error={errors.contactEmail?.message}>
          {(p) => <Input {...p} type="email" {...register('contactEmail')} />}
        </Field>
      </div>
      <Field label="Base address" error={errors.addressLine?.message}>
        {(p) => <Input {...p} autoComplete="street-address" {...register('addressLine')} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="City" error={errors.city?.message}>
          {(p) => <Input {...p} {...register('city')} />}
        </Field>
        <Field label="State or province" error={errors.region?.message}>
          {(p) => <Input {...p} {...register('region')} />}
        </Field>
        <Field label="Postal code" error={errors.postalCode?.message}>
          {(p) => (
            <div className="flex gap-2">
              <Input {...p} autoComplete="postal-code" {...register('postalCode', { setValueAs: blankToNull })} />
              <Button variant="secondary" onClick={lookUp} pending={looking}>
                Look up
              </Button>
            </div>
          )}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Latitude" hint="Decimal degrees, north positive" error={errors.latitude?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('latitude', { setValueAs: toNumber })} />}
        </Field>
        <Field label="Longitude" hint="Decimal degrees, east positive" error={errors.longitude?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('longitude', { setValueAs: toNumber })} />}
        </Field>
        <Field label="Time zone" error={errors.timeZone?.message}>
          {(p) => (
            <Select {...p} {...register('timeZone')}>
              {[...new Set([profile.timeZone, ...commonTimeZones])].map((tz) => (
                <option key={tz} value={tz}>
                  {tz.replace('_', ' ')}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Button type="submit" pending={save.isPending}>
        Save the profile
      </Button>
    </form>
  );
}
