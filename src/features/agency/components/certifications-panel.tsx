import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createCertificationSchema, revokeCertificationSchema, type CertificationItem } from '@shared/schemas/admin';
import { Badge } from '@/components/ui/badge';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { Skeleton } from '@/components/ui/skeleton';
import { errorMessage, isApiError } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDate } from '@/lib/format';
import { useCertifications } from '../api/get-certifications';
import { useCreateCertification } from '../api/create-certification';
import { useUpdateCertification } from '../api/update-certification';
import { useRevokeCertification } from '../api/revoke-certification';
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
  const [revoking, setRevoking] = useState<string | null>(null);
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
              {c.revokedAt ? (
                <>
                  <Badge tone="red">Revoked</Badge>
                  <span className="basis-full text-ink-700">
                    Revoked {formatDate(c.revokedAt.slice(0, 10))}
                    {c.revokedByName && ` by ${c.revokedByName}`}: {c.revokeReason}
                  </span>
                </>
              ) : (
                <>
                  <CertificationBadge state={c.state} />
                  <Button size="sm" variant="ghost" onClick={() => startEdit(c)}>
                    Edit
                  </Button>
                  <Button size="sm" variant="ghost" onClick={() => setRevoking(revoking === c.id ? null : c.id)} aria-expanded={revoking === c.id}>
                    Revoke
                  </Button>
                  {revoking === c.id && (
                    <RevokeForm
                      cert={c}
                      onDone={(msg) => {
                        if (editing?.id === c.id) startEdit(null);
                        setRevoking(null);
                        setSaved(msg);
                      }}
                      onCancel={() => setRevoking(null)}
                    />
                  )}
                </>
              )}
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

/** Asks why the certificate is revoked; the reason is required and shown in the list afterwards. */
function RevokeForm({ cert, onDone, onCancel }: { cert: CertificationItem; onDone: (message: string) => void; onCancel: () => void }) {
  const revoke = useRevokeCertification();
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    const parsed = revokeCertificationSchema.safeParse({ reason });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? 'Enter why the certificate is revoked.');
      return;
    }
    setError(null);
    revoke.mutate(
      { id: cert.id, body: parsed.data },
      {
        onSuccess: (c) => onDone(`Revoked certificate ${c.certificateNumber} (${c.familyName}).`),
        onError: (err) => setError(isApiError(err) && err.fields?.reason ? err.fields.reason : errorMessage(err)),
      },
    );
  };
  return (
    <form onSubmit={submit} noValidate className="basis-full space-y-2 rounded-md bg-ink-50 p-2" aria-label={`Revoke certificate ${cert.certificateNumber}`}>
      <Field label="Reason for revoking" error={error ?? undefined}>
        {(p) => <Input {...p} autoComplete="off" value={reason} onChange={(e) => setReason(e.target.value)} />}
      </Field>
      <div className="flex gap-2">
        <Button type="submit" size="sm" pending={revoke.isPending}>
          Revoke the certificate
        </Button>
        <Button size="sm" variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
