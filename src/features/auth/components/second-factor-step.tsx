import { useState } from 'react';
import type { MeResponse } from '@shared/schemas/user';
import type { SecondFactorChallenge } from '@shared/schemas/second-factor';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { errorMessage } from '@/lib/api-client';
import { useStartSession } from '../api/sign-in';
import { useVerifySecondFactor } from '../api/verify-second-factor';
import { useSignInWithPasskey } from '../api/sign-in-with-passkey';
import { TotpEnrolment } from './totp-enrolment';

/** After a right password: the code, a recovery code or a passkey; or, for an account that must have one, setting up the authenticator. */
export function SecondFactorStep({ challenge, onSuccess, onRestart }: { challenge: SecondFactorChallenge; onSuccess: (me: MeResponse) => void; onRestart: () => void }) {
  const start = useStartSession();
  const verify = useVerifySecondFactor();
  const passkey = useSignInWithPasskey();
  const { purpose, methods } = challenge.secondFactor;
  const [method, setMethod] = useState<'totp' | 'recovery'>(methods.includes('totp') ? 'totp' : 'recovery');
  const [code, setCode] = useState('');
  const done = (me: MeResponse) => {
    start(me);
    onSuccess(me);
  };

  if (purpose === 'enrol') {
    return (
      <div className="space-y-4">
        <Alert tone="info">Your account needs a second factor. Set up an authenticator app to finish signing in.</Alert>
        <TotpEnrolment during="sign-in" onDone={(a) => a.user && done(a as MeResponse)} />
      </div>
    );
  }

  const error = verify.error ?? passkey.error;
  const expired = error && 'status' in error && error.status === 401 && (error as { code?: string }).code === 'unauthenticated';
  return (
    <div className="space-y-4">
      <form
        aria-label="Second factor"
        noValidate
        className="space-y-4"
        onSubmit={(e) => {
          e.preventDefault();
          verify.mutate({ method, code }, { onSuccess: done });
        }}
      >
        {error && (
          <Alert tone="error">
            {errorMessage(error)}{' '}
            {expired && (
              <button type="button" className="underline" onClick={onRestart}>
                Sign in again
              </button>
            )}
          </Alert>
        )}
        {method === 'totp' ? (
          <Field label="Authenticator code" hint="The 6-digit code your authenticator app shows for Fieldproof.">
            {(p) => <Input {...p} value={code} onChange={(e) => setCode(e.target.value)} inputMode="numeric" autoComplete="one-time-code" maxLength={8} autoFocus />}
          </Field>
        ) : (
          <Field label="Recovery code" hint="One of the codes you kept when you set up the second factor. Each works once.">
            {(p) => <Input {...p} value={code} onChange={(e) => setCode(e.target.value)} autoComplete="off" autoCapitalize="characters" spellCheck={false} maxLength={20} autoFocus />}
          </Field>
        )}
        <Button type="submit" className="w-full" pending={verify.isPending}>
          Verify
        </Button>
      </form>
      {methods.includes('passkey') && (
        <Button variant="secondary" className="w-full" pending={passkey.isPending} onClick={() => passkey.mutate(undefined, { onSuccess: done })}>
          Use a passkey
        </Button>
      )}
      <p className="flex flex-wrap justify-between gap-2 text-sm">
        {methods.includes('totp') && methods.includes('recovery') && (
          <button
            type="button"
            className="text-ink-700 underline underline-offset-2 hover:text-ink-900"
            onClick={() => {
              setMethod(method === 'totp' ? 'recovery' : 'totp');
              setCode('');
              verify.reset();
            }}
          >
            {method === 'totp' ? 'Use a recovery code instead' : 'Use the authenticator app instead'}
          </button>
        )}
        <button type="button" className="text-ink-700 underline underline-offset-2 hover:text-ink-900" onClick={onRestart}>
          Start over
        </button>
      </p>
    </div>
  );
}
