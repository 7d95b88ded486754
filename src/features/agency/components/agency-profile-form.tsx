import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { agencyProfileSchema, type AgencyProfile } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { applyServerErrors } from '@/lib/form-errors';
import { useUpdateAgencyProfile } from '../api/update-agency-profile';
import { lookupPostalCode } from '../api/lookup-postal-code';
import { AgencyFields } from '@/components/forms/agency-fields';

type Values = z.input<typeof agencyProfileSchema>;
const fieldNames = ['name', 'contactEmail', 'addressLine', 'city', 'region', 'postalCode', 'latitude', 'longitude', 'timeZone'] as const;

/** The agency's name, contact and base (travel is measured from the base coordinates). */
export function AgencyProfileForm({ profile }: { profile: AgencyProfile }) {
  const save = useUpdateAgencyProfile();
  const [formError, setFormError] = useState<string | null>(null);
  const [note, setNote] = useState<{ tone: 'success' | 'warning' | 'info'; text: string } | null>(null);
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
      <AgencyFields
        register={register}
        errors={errors}
        getValues={getValues}
        setValue={setValue}
        currentTimeZone={profile.timeZone}
        lookupPostalCode={lookupPostalCode}
        coordinateHint={{ latitude: 'Decimal degrees, north positive', longitude: 'Decimal degrees, east positive' }}
      />
      <Button type="submit" pending={save.isPending}>
        Save the profile
      </Button>
    </form>
  );
}
