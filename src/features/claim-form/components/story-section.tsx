import type { UseFormReturn } from 'react-hook-form';
import { Textarea } from '@/components/ui/input';
import { fieldDomId, type ClaimFormValues } from '../form-model';
import { FormField } from './form-field';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';

const fields = [
  { name: 'complaint', label: 'Complaint', hint: 'What the restaurant reported, in their words.' },
  { name: 'cause', label: 'Cause', hint: 'What you found, with the measurement that showed it.' },
  { name: 'correction', label: 'Correction', hint: 'What you did, which parts you replaced and how you verified the repair.' },
] as const;

export function StorySection({ form, note }: { form: UseFormReturn<ClaimFormValues>; note?: ReturnInfo | null }) {
  const { register, formState } = form;
  return (
    <FormSection id="section-story" title="Complaint, cause and correction" note={note}>
      {fields.map((f) => (
        <FormField key={f.name} id={fieldDomId(f.name)} label={f.label} hint={f.hint} error={formState.errors[f.name]?.message}>
          {(p) => <Textarea {...p} rows={3} maxLength={4000} {...register(f.name)} />}
        </FormField>
      ))}
    </FormSection>
  );
}
