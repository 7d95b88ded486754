import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router';
import { z } from 'zod';
import { MIN_PASSWORD_LENGTH, newPasswordSchema } from '@shared/schemas/user';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { paths } from '@/config/paths';
import { useConfirmPasswordReset } from '../api/confirm-password-reset';

const schema = z
  .object({ password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });
type Values = z.infer<typeof schema>;
const fieldNames = ['password'] as const;

export function ResetPasswordForm({ token }: { token: string }) {
  const [formError, setFormError] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { password: '', confirm: '' } });
  const confirm = useConfirmPasswordReset();

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    confirm.mutate(
      { token, password: values.password },
      {
        onSuccess: () => setDone(true),
        onError: (e) => setFormError(applyServerErrors(e, setError, fieldNames)),
      },
    );
  });

  if (done) {
    return (
      <div className="space-y-4">
        <Alert tone="success" title="Password changed">
          Every earlier session has ended. Sign in with the new password.
        </Alert>
        <Link to={paths.signIn} className="block text-center text-ink-700 underline underline-offset-2">
          Go to sign-in
        </Link>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Choose a new password">
      {formError && (
        <Alert tone="error">
          {formError}{' '}
          <Link to={paths.forgotPassword} className="underline underline-offset-2">
            Ask for a new link
          </Link>
        </Alert>
      )}
      <Field
        label="New password"
        hint={`At least ${MIN_PASSWORD_LENGTH} characters; no symbols or digits needed.`}
        error={errors.password?.message}
      >
        {(p) => <Input {...p} type="password" autoComplete="new-password" {...register('password')} />}
      </Field>
      <Field label="New password again" error={errors.confirm?.message}>
        {(p) => <Input {...p} type="password" autoComplete="new-password" {...register('confirm')} />}
      </Field>
      <Button type="submit" className="w-full" pending={confirm.isPending}>
        Save the new password
      </Button>
    </form>
  );
}
