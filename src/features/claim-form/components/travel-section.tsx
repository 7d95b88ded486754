import { useWatch, type UseFormReturn } from 'react-hook-form';
import { haversineKm, KM_PER_MILE, type LatLon } from '@shared/calculations/travel';
import { Input } from '@/components/ui/input';
import { typedNumberValue } from '@/lib/number-input';
import { fieldDomId, type ClaimFormValues } from '../form-model';
import { FormField, GroupError } from './form-field';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';

export function TravelSection({
  form,
  base,
  site,
  caps,
  note,
}: {
  form: UseFormReturn<ClaimFormValues>;
  base: LatLon | null;
  site: LatLon | null;
  caps: { maxRoundTripMiles: number | null; maxTravelHours: number | null } | null;
  note?: ReturnInfo | null;
}) {
  const { control, register, setValue, formState } = form;
  const travel = useWatch({ control, name: 'travel' });
  const straightMiles = base && site ? (2 * haversineKm(base, site)) / KM_PER_MILE : null;
  const e = formState.errors.travel;
  const capText = caps
    ? [caps.maxRoundTripMiles !== null ? `up to ${caps.maxRoundTripMiles} miles` : null, caps.maxTravelHours !== null ? `up to ${caps.maxTravelHours} h` : null].filter(Boolean).join(' and ')
    : '';
  return (
    <FormSection id="section-travel" title="Travel" description={capText ? `Your contract pays a round trip ${capText}.` : undefined} note={note}>
      <label className="flex min-h-11 items-center gap-2 text-sm font-medium text-ink-800">
        <input
          id={fieldDomId('travel')}
          type="checkbox"
          className="size-5 accent-ink-700"
          checked={!!travel}
          onChange={(ev) => setValue('travel', ev.target.checked ? { roundTripMiles: Number.NaN, travelHours: Number.NaN } : null, { shouldDirty: true })}
        />
        Claim travel to the site
      </label>
      {travel && (
        <div className="grid gap-4 sm:grid-cols-2">
          <FormField
            id={fieldDomId('travel.roundTripMiles')}
            label="Round trip (miles)"
            hint={straightMiles !== null ? `The straight-line round trip from your base is ${straightMiles.toFixed(1)} miles; roads run longer.` : 'From your base to the site and back.'}
            error={e?.roundTripMiles?.message}
          >
            {(p) => <Input {...p} type="text" inputMode="decimal" autoComplete="off" {...register('travel.roundTripMiles', { setValueAs: typedNumberValue })} />}
          </FormField>
          <FormField id={fieldDomId('travel.travelHours')} label="Travel time (hours)" hint="Both ways together." error={e?.travelHours?.message}>
            {(p) => <Input {...p} type="text" inputMode="decimal" autoComplete="off" {...register('travel.travelHours', { setValueAs: typedNumberValue })} />}
          </FormField>
        </div>
      )}
      <GroupError>{e?.message}</GroupError>
    </FormSection>
  );
}
