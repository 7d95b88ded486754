import { useEffect, useRef, useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Modal } from '@/components/ui/modal';
import { errorMessage, setStepUpHandler } from '@/lib/api-client';
import { useStepUp } from '../api/step-up';

/**
 * Mounted once: when a sensitive change answers `step_up_required`, this dialog asks for the
 * password or an authenticator code, then the change is sent again (see setStepUpHandler).
 */
export function StepUpDialog() {
  const [open, setOpen] = useState(false);
  const [mode, setMode] = useState<'password' | 'code'>('password');
  const [value, setValue] = useState('');
  const waiting = useRef<{ resolve: () => void; reject: (e: Error) => void } | null>(null);
  const stepUp = useStepUp();

  useEffect(() => {
    setStepUpHandler(
      () =>
        new Promise<void>((resolve, reject) => {
          waiting.current?.reject(new Error('replaced'));
          waiting.current = { resolve, reject };
          setValue('');
          stepUp.reset();
          setOpen(true);
        }),
    );
    return () => setStepUpHandler(null);
    // stepUp.reset is stable
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  const close = () => {
    setOpen(false);
    waiting.current?.reject(new Error('cancelled'));
    waiting.current = null;
  };

  return (
    <Modal open={open} onClose={close} title="Confirm it is you">
      <form
        aria-label="Confirm it is you"
        noValidate
        className="space-y-4"
        onSubmit={(e) => {
          e.preventDefault();
          stepUp.mutate(mode === 'password' ? { password: value } : { code: value }, {
            onSuccess: () => {
              setOpen(false);
              waiting.current?.resolve();
              waiting.current = null;
            },
          });
        }}
      >
        <p className="text-sm text-ink-700">This change needs a recent sign-in. Enter your {mode === 'password' ? 'password' : 'authenticator code'} to go on.</p>
        {stepUp.isError && <Alert tone="error">{errorMessage(stepUp.error)}</Alert>}
        {mode === 'password' ? (
          <Field label="Your password">
            {(p) => <Input {...p} type="password" autoComplete="current-password" value={value} onChange={(e) => setValue(e.target.value)} autoFocus />}
          </Field>
        ) : (
          <Field label="Authenticator code">
            {(p) => <Input {...p} value={value} onChange={(e) => setValue(e.target.value)} inputMode="numeric" autoComplete="one-time-code" maxLength={8} autoFocus />}
          </Field>
        )}
        <div className="flex flex-wrap items-center justify-between gap-2">
          <button
            type="button"
            className="text-sm text-ink-700 underline underline-offset-2 hover:text-ink-900"
            onClick={() => {
              setMode(mode === 'password' ? 'code' : 'password');
              setValue('');
              stepUp.reset();
            }}
          >
            {mode === 'password' ? 'Use an authenticator code instead' : 'Use your password instead'}
          </button>
          <div className="flex gap-2">
            <Button variant="secondary" onClick={close}>
              Cancel
            </Button>
            <Button type="submit" pending={stepUp.isPending}>
              Confirm
            </Button>
          </div>
        </div>
      </form>
    </Modal>
  );
}
