import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router';
import { signInBodySchema, type MeResponse, type SignInBody } from '@shared/schemas/user';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { paths } from '@/config/paths';
import type { SecondFactorChallenge } from '@shared/schemas/second-factor';
import { useSignIn } from '../api/sign-in';
import { SecondFactorStep } from './second-factor-step';

const fieldNames = ['email', 'password'] as const;

export function SignInForm({ onSuccess }: { onSuccess: (me: MeResponse) => void }) {
  const [formError, setFormError] = useState<string | null>(null);
  const [challenge, setChallenge] = useState<SecondFactorChallenge | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<SignInBody>({ resolver: zodResolver(signInBodySchema), defaultValues: { email: '', password: '' } });
  const signIn = useSignIn({ onSuccess, onSecondFactor: setChallenge });

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    signIn.mutate(values, {
      onError: (e) => setFormError(applyServerErrors(e, setError, fieldNames)),
    });
  });

  if (challenge) return <SecondFactorStep challenge={challenge} onSuccess={onSuccess} onRestart={() => setChallenge(null)} />;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Sign in">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="E-mail" error={errors.email?.message}>
        {(p) => <Input {...p} type="email" autoComplete="username" inputMode="email" autoCapitalize="none" spellCheck={false} {...register('email')} />}
      </Field>
      <Field label="Password" error={errors.password?.message}>
        {(p) => <Input {...p} type="password" autoComplete="current-password" {...register('password')} />}
      </Field>
      <Button type="submit" className="w-full" pending={signIn.isPending}>
        Sign in
      </Button>
      <p className="text-center text-sm">
        <Link to={paths.forgotPassword} className="text-ink-700 underline underline-offset-2 hover:text-ink-900">
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}
