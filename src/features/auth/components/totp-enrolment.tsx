import { useEffect, useState } from 'react';
import type { MeResponse } from '@shared/schemas/user';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/api-client';
import { useStartTotpEnrolment } from '../api/start-totp-enrolment';
import { useConfirmTotpEnrolment, type ConfirmTotpAnswer } from '../api/confirm-totp-enrolment';
import { RecoveryCodesList } from './recovery-codes-list';

/**
 * Setting up an authenticator app: the QR code (or the key to type), then the first code to
 * confirm it, then the recovery codes, shown once.
 */
export function TotpEnrolment({ during, onDone }: { during: 'sign-in' | 'account'; onDone: (answer: ConfirmTotpAnswer & { me?: MeResponse }) => void }) {
  const start = useStartTotpEnrolment(during);
  const confirm = useConfirmTotpEnrolment();
  const [code, setCode] = useState('');
  const [answer, setAnswer] = useState<ConfirmTotpAnswer | null>(null);
  const { mutate: begin } = start;
  useEffect(() => {
    begin();
  }, [begin]);

  if (answer) {
    return answer.recoveryCodes.length > 0 ? <RecoveryCodesList codes={answer.recoveryCodes} onDone={() => onDone(answer)} /> : <Button onClick={() => onDone(answer)}>Continue</Button>;
  }
  if (start.isError) return <Alert tone="error">{errorMessage(start.error)}</Alert>;
  if (!start.data) return <Spinner />;
  const setup = start.data;
  return (
    <form
      aria-label="Set up an authenticator app"
      noValidate
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        confirm.mutate({ during, code }, { onSuccess: setAnswer });
      }}
    >
      <ol className="list-decimal space-y-2 pl-5 text-sm text-ink-800">
        <li>Open an authenticator app on your phone and add an account.</li>
        <li>Scan this QR code, or type the key below.</li>
        <li>Enter the 6-digit code the app shows.</li>
      </ol>
      <img src={setup.qrDataUrl} alt="QR code for your authenticator app" className="mx-auto size-48 rounded-md border border-ink-100 bg-white p-2" />
      <p className="text-sm text-ink-700">
        Key to type in:{' '}
        <code className="break-all rounded bg-ink-50 px-1 font-mono text-ink-900" aria-label="Authenticator key">
          {setup.secret.replace(/(.{4})/g, '$1 ').trim()}
        </code>
      </p>
      {confirm.isError && <Alert tone="error">{errorMessage(confirm.error)}</Alert>}
      <Field label="Authenticator code">
        {(p) => <Input {...p} value={code} onChange={(e) => setCode(e.target.value)} inputMode="numeric" autoComplete="one-time-code" maxLength={8} />}
      </Field>
      <Button type="submit" className="w-full" pending={confirm.isPending}>
        Confirm
      </Button>
    </form>
  );
}
