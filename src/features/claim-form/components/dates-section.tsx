import type { UseFormReturn } from 'react-hook-form';
import { Input } from '@/components/ui/input';
import { useBusinessToday } from '@/lib/business-day';
import { formatDate } from '@/lib/format';
import { addDays } from '@shared/calculations/dates';
import { fieldDomId, type ClaimFormValues } from '../form-model';
import { FormField } from './form-field';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';

const emptyToNull = (v: unknown) => (v === '' || v === undefined ? null : v);

export function DatesSection({ form, note, filingWindowDays }: { form: UseFormReturn<ClaimFormValues>; note?: ReturnInfo | null; filingWindowDays: number | null }) {
  const { register, formState, watch } = form;
  const repairDate = watch('repairDate');
  const today = useBusinessToday();
  return (
    <FormSection id="section-dates" title="Dates" note={note}>
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField id={fieldDomId('failureDate')} label="Failure date" hint="The day the unit failed (coverage is judged on it)." error={formState.errors.failureDate?.message}>
          {(p) => <Input {...p} type="date" max={today} {...register('failureDate', { setValueAs: emptyToNull })} />}
        </FormField>
        <FormField
          id={fieldDomId('repairDate')}
          label="Repair date"
          hint={
            filingWindowDays && repairDate && /^\d{4}-\d{2}-\d{2}$/.test(repairDate)
              ? `File by ${formatDate(addDays(repairDate, filingWindowDays))} (${filingWindowDays} days from the repair).`
              : 'The day you completed the repair.'
          }
          error={formState.errors.repairDate?.message}
        >
          {(p) => <Input {...p} type="date" max={today} {...register('repairDate', { setValueAs: emptyToNull })} />}
        </FormField>
      </div>
    </FormSection>
  );
}
