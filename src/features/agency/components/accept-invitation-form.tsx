import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { roleLabels } from '@shared/permissions/ability';
import { newPasswordSchema, MIN_PASSWORD_LENGTH } from '@shared/schemas/user';
import { personNameSchema, type InvitationPreview } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDateTime } from '@/lib/format';
import { useAcceptInvitation } from '../api/accept-invitation';

const schema = z
  .object({ name: personNameSchema, password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });
type Values = z.input<typeof schema>;
const fieldNames = ['name', 'password'] as const;

/** The invitee sets a name and a password (same policy as every password); then signs in. */
export function AcceptInvitationForm({ token, preview, onAccepted }: { token: string; preview: InvitationPreview; onAccepted: (email: string) => void }) {
  const [formError, setFormError] = useState<string | null>(null);
  const accept = useAcceptInvitation();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof schema>>({ resolver: zodResolver(schema), defaultValues: { name: '', password: '', confirm: '' } });

  const onSubmit = handleSubmit((v) => {
    setFormError(null);
    accept.mutate(
      { token, name: v.name, password: v.password },
      { onSuccess: (r) => onAccepted(r.email), onError: (e) => setFormError(applyServerErrors(e, setError, fieldNames)) },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Accept the invitation">
      <Alert tone="info">
        Joining <strong>{preview.organisationName}</strong> as {roleLabels[preview.role].toLowerCase()}, with the e-mail address <strong>{preview.email}</strong>. The link
        works until {formatDateTime(preview.expiresAt)}.
      </Alert>
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Your name" error={errors.name?.message}>
        {(p) => <Input {...p} autoComplete="name" {...register('name')} />}
      </Field>
      <Field label="Password" hint={`At least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words make a strong one; no symbols needed.`} error={errors.password?.message}>
        {(p) => <Input {...p} type="password" autoComplete="new-password" {...register('password')} />}
      </Field>
      <Field label="Password again" error={errors.confirm?.message}>
        {(p) => <Input {...p} type="password" autoComplete="new-password" {...register('confirm')} />}
      </Field>
      <Button type="submit" className="w-full" pending={accept.isPending}>
        Create my account
      </Button>
    </form>
  );
}
