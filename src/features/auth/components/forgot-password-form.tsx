import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router';
import { passwordResetRequestSchema } from '@shared/schemas/user';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { paths } from '@/config/paths';
import { useRequestPasswordReset } from '../api/request-password-reset';

const fieldNames = ['email'] as const;

export function ForgotPasswordForm() {
  const [formError, setFormError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<{ email: string }>({ resolver: zodResolver(passwordResetRequestSchema), defaultValues: { email: '' } });
  const request = useRequestPasswordReset();

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    request.mutate(values, {
      onSuccess: () => setSentTo(values.email),
      onError: (e) => setFormError(applyServerErrors(e, setError, fieldNames)),
    });
  });

  if (sentTo) {
    return (
      <div className="space-y-4">
        <Alert tone="success" title="Check your e-mail">
          If an account uses {sentTo}, a link to choose a new password is on its way. The link works once, for 30 minutes.
        </Alert>
        <p className="text-center text-sm">
          <Link to={paths.signIn} className="text-ink-700 underline underline-offset-2">
            Back to sign-in
          </Link>
        </p>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Request a password reset">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="E-mail" hint="We send a one-time link to this address." error={errors.email?.message}>
        {(p) => <Input {...p} type="email" autoComplete="email" inputMode="email" autoCapitalize="none" spellCheck={false} {...register('email')} />}
      </Field>
      <Button type="submit" className="w-full" pending={request.isPending}>
        Send the link
      </Button>
      <p className="text-center text-sm">
        <Link to={paths.signIn} className="text-ink-700 underline underline-offset-2">
          Back to sign-in
        </Link>
      </p>
    </form>
  );
}
