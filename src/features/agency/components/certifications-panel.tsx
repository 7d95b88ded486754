import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createCertificationSchema, type CertificationItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { Skeleton } from '@/components/ui/skeleton';
import { errorMessage } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDate } from '@/lib/format';
import { useCertifications } from '../api/get-certifications';
import { useCreateCertification } from '../api/create-certification';
import { useUpdateCertification } from '../api/update-certification';
import { useFamilies } from '../api/get-families';
import { CertificationBadge } from './certification-badge';

type Values = z.input<typeof createCertificationSchema>;
const fieldNames = ['familyId', 'certificateNumber', 'validFrom', 'validTo', 'attachmentId'] as const;

/** One technician's certificates and the form that records (or corrects) one. */
export function CertificationsPanel({ user }: { user: { id: string; name: string } }) {
  const certs = useCertifications(user.id);
  const families = useFamilies();
  const create = useCreateCertification();
  const update = useUpdateCertification();
  const [editing, setEditing] = useState<CertificationItem | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const empty: Values = { userId: user.id, familyId: '', certificateNumber: '', validFrom: '', validTo: '', attachmentId: null };
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof createCertificationSchema>>({ resolver: zodResolver(createCertificationSchema), defaultValues: empty });

  const startEdit = (c: CertificationItem | null) => {
    setEditing(c);
    setFormError(null);
    setSaved(null);
    reset(c ? { userId: user.id, familyId: c.familyId, certificateNumber: c.certificateNumber, validFrom: c.validFrom, validTo: c.validTo, attachmentId: c.attachmentId } : empty);
  };

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    setSaved(null);
    const done = (c: CertificationItem) => {
      startEdit(null);
      setSaved(`Saved certificate ${c.certificateNumber} (${c.familyName}).`);
    };
    const fail = (e: unknown) => setFormError(applyServerErrors(e, setError, fieldNames));
    if (editing) {
      const { userId: _u, ...body } = values;
      update.mutate({ id: editing.id, body }, { onSuccess: done, onError: fail });
    } else {
      create.mutate(values, { onSuccess: done, onError: fail });
    }
  });

  return (
    <div className="space-y-4">
      {certs.isPending && <Skeleton className="h-20" />}
      {certs.isError && <Alert tone="error">{errorMessage(certs.error)}</Alert>}
      {certs.data && certs.data.length === 0 && <p className="text-sm text-ink-600">No certificates on file for {user.name}.</p>}
      {certs.data && certs.data.length > 0 && (
        <ul className="divide-y divide-ink-100 rounded-md border border-ink-100" aria-label={`Certificates of ${user.name}`}>
          {certs.data.map((c) => (
            <li key={c.id} className="flex flex-wrap items-center gap-2 px-3 py-2 text-sm">
              <span className="min-w-0 flex-1">
                <span className="font-medium text-ink-900">{c.familyName}</span> · No. {c.certificateNumber}
                <span className="block text-ink-600">
                  {formatDate(c.validFrom)} to {formatDate(c.validTo)}
                  {c.state === 'expiring' && ` · ${c.daysLeft} days left`}
                </span>
              </span>
              <CertificationBadge state={c.state} />
              <Button size="sm" variant="ghost" onClick={() => startEdit(c)}>
                Edit
              </Button>
            </li>
          ))}
        </ul>
      )}

      <form onSubmit={onSubmit} noValidate className="space-y-3 rounded-md border border-ink-100 p-3" aria-label={editing ? 'Correct the certificate' : 'Record a certificate'}>
        <h3 className="font-semibold text-ink-900">{editing ? `Correct certificate ${editing.certificateNumber}` : 'Record a certificate'}</h3>
        {formError && <Alert tone="error">{formError}</Alert>}
        {saved && <Alert tone="success">{saved}</Alert>}
        <Field label="Product family" error={errors.familyId?.message}>
          {(p) => (
            <Select {...p} {...register('familyId')}>
              <option value="">Choose…</option>
              {(families.data ?? []).map((f) => (
                <option key={f.id} value={f.id}>
                  {f.name} ({f.code})
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Certificate number" error={errors.certificateNumber?.message}>
          {(p) => <Input {...p} autoComplete="off" {...register('certificateNumber')} />}
        </Field>
        <div className="grid gap-3 sm:grid-cols-2">
          <Field label="Valid from" error={errors.validFrom?.message}>
            {(p) => <Input {...p} type="date" {...register('validFrom')} />}
          </Field>
          <Field label="Valid to (last day)" error={errors.validTo?.message}>
            {(p) => <Input {...p} type="date" {...register('validTo')} />}
          </Field>
        </div>
        {errors.attachmentId?.message && <Alert tone="error">{errors.attachmentId.message}</Alert>}
        <div className="flex gap-2">
          <Button type="submit" pending={create.isPending || update.isPending}>
            {editing ? 'Save the correction' : 'Record the certificate'}
          </Button>
          {editing && (
            <Button variant="ghost" onClick={() => startEdit(null)}>
              Cancel
            </Button>
          )}
        </div>
      </form>
    </div>
  );
}
