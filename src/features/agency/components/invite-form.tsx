import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { inviteBodySchema, INVITATION_TTL_DAYS } from '@shared/schemas/admin';
import { roleLabels, type Role } from '@shared/permissions/ability';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { useInviteUser } from '../api/invite-user';
import type { UsersScope } from '../api/agency-keys';

type Values = z.input<typeof inviteBodySchema>;
const fieldNames = ['email', 'role'] as const;

/** E-mail and role; the invitee chooses their own name and password from the link. */
export function InviteForm({ scope, roles, onDone }: { scope: UsersScope; roles: readonly Role[]; onDone: (email: string) => void }) {
  const [formError, setFormError] = useState<string | null>(null);
  const invite = useInviteUser(scope);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values, unknown, z.output<typeof inviteBodySchema>>({ resolver: zodResolver(inviteBodySchema), defaultValues: { email: '', role: roles[0] } });

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    invite.mutate(values, {
      onSuccess: (inv) => onDone(inv.email),
      onError: (e) => setFormError(applyServerErrors(e, setError, fieldNames)),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Invite a user">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="E-mail address" error={errors.email?.message}>
        {(p) => <Input {...p} type="email" autoComplete="off" {...register('email')} />}
      </Field>
      <Field label="Role" error={errors.role?.message}>
        {(p) => (
          <Select {...p} {...register('role')}>
            {roles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <p className="text-sm text-ink-600">They get a link that works once, for {INVITATION_TTL_DAYS} days, to set their name and password.</p>
      <Button type="submit" pending={invite.isPending}>
        Send the invitation
      </Button>
    </form>
  );
}
