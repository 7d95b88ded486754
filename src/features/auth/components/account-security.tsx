import { useId, useState } from 'react';
import type { SecurityStatus } from '@shared/schemas/second-factor';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Skeleton } from '@/components/ui/skeleton';
import { errorMessage } from '@/lib/api-client';
import { formatDate } from '@/lib/format';
import { useSecurity } from '../api/get-security';
import { useAddPasskey } from '../api/add-passkey';
import { useRemovePasskey } from '../api/remove-passkey';
import { useRemoveTotp } from '../api/remove-totp';
import { useRegenerateRecoveryCodes } from '../api/regenerate-recovery-codes';
import { useSetOrganisationRequirement } from '../api/set-organisation-requirement';
import { RecoveryCodesList } from './recovery-codes-list';
import { TotpEnrolment } from './totp-enrolment';

/** The signed-in user's second factors (authenticator app, passkeys, recovery codes) and, for an admin, the organisation's rule. */
export function AccountSecurity() {
  const security = useSecurity();
  // Recovery codes just issued (by any step), shown once until the user confirms they kept them.
  const [codes, setCodes] = useState<string[] | null>(null);

  if (security.isError) return <Alert tone="error">{errorMessage(security.error)}</Alert>;
  if (!security.data) return <Skeleton className="h-48" />;
  const s = security.data;
  const hasFactor = s.totp || s.passkeys.length > 0;

  return (
    <div className="space-y-5">
      {s.required && !hasFactor && <Alert tone="warning">Your account needs a second factor. Set up an authenticator app or add a passkey.</Alert>}
      {codes && codes.length > 0 && (
        <Card aria-labelledby="new-codes-title">
          <CardHeader id="new-codes-title" title="Your new recovery codes" />
          <CardBody>
            <RecoveryCodesList codes={codes} doneLabel="Done" onDone={() => setCodes(null)} />
          </CardBody>
        </Card>
      )}
      <TotpCard status={s} />
      <PasskeysCard status={s} onCodes={setCodes} />
      <RecoveryCard status={s} hasFactor={hasFactor} onCodes={setCodes} />
      {s.organisation.canChange && <OrganisationCard status={s} />}
    </div>
  );
}

function TotpCard({ status }: { status: SecurityStatus }) {
  const [setting, setSetting] = useState(false);
  const remove = useRemoveTotp();
  return (
    <Card aria-labelledby="totp-title">
      <CardHeader id="totp-title" title="Authenticator app" description="A 6-digit code from an app on your phone, asked after your password." />
      <CardBody className="space-y-3">
        <p className="text-sm text-ink-800" data-testid="totp-state">
          {status.totp ? 'An authenticator app is set up.' : 'No authenticator app is set up.'}
        </p>
        {remove.isError && <Alert tone="error">{errorMessage(remove.error)}</Alert>}
        {setting ? (
          // Stays up after the confirm (when the status already says "set up") until the recovery codes were kept.
          <div className="max-w-sm">
            <TotpEnrolment during="account" onDone={() => setSetting(false)} />
            <Button variant="ghost" size="sm" className="mt-2" onClick={() => setSetting(false)}>
              Cancel
            </Button>
          </div>
        ) : status.totp ? (
          <Button variant="secondary" size="sm" pending={remove.isPending} onClick={() => remove.mutate()}>
            Remove the authenticator app
          </Button>
        ) : (
          <Button size="sm" onClick={() => setSetting(true)}>
            Set up an authenticator app
          </Button>
        )}
      </CardBody>
    </Card>
  );
}

function PasskeysCard({ status, onCodes }: { status: SecurityStatus; onCodes: (c: string[]) => void }) {
  const [name, setName] = useState('');
  const add = useAddPasskey();
  const remove = useRemovePasskey();
  const listId = useId();
  return (
    <Card aria-labelledby="passkeys-title">
      <CardHeader id="passkeys-title" title="Passkeys" description="Sign in with this device's screen lock or a security key instead of a code." />
      <CardBody className="space-y-4">
        {status.passkeys.length === 0 ? (
          <p className="text-sm text-ink-700">No passkeys yet.</p>
        ) : (
          <ul aria-label="Your passkeys" id={listId} className="divide-y divide-ink-100 rounded-md border border-ink-100">
            {status.passkeys.map((p) => (
              <li key={p.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
                <div className="min-w-0">
                  <p className="break-words font-medium text-ink-900">{p.name}</p>
                  <p className="text-sm text-ink-600">
                    Added {formatDate(p.createdAt)} · {p.lastUsedAt ? `last used ${formatDate(p.lastUsedAt)}` : 'not used yet'}
                  </p>
                </div>
                <Button variant="secondary" size="sm" aria-label={`Remove passkey ${p.name}`} pending={remove.isPending && remove.variables === p.id} onClick={() => remove.mutate(p.id)}>
                  Remove
                </Button>
              </li>
            ))}
          </ul>
        )}
        {remove.isError && <Alert tone="error">{errorMessage(remove.error)}</Alert>}
        <form
          aria-label="Add a passkey"
          noValidate
          className="flex max-w-md flex-col gap-3 sm:flex-row sm:items-end"
          onSubmit={(e) => {
            e.preventDefault();
            add.mutate(
              { name },
              {
                onSuccess: (a) => {
                  setName('');
                  if (a.recoveryCodes.length > 0) onCodes(a.recoveryCodes);
                },
              },
            );
          }}
        >
          <Field label="Passkey name" hint="So you can tell your passkeys apart, e.g. “Work laptop”." className="flex-1">
            {(p) => <Input {...p} value={name} onChange={(e) => setName(e.target.value)} maxLength={60} autoComplete="off" />}
          </Field>
          <Button type="submit" size="md" pending={add.isPending}>
            Add a passkey
          </Button>
        </form>
        {add.isError && <Alert tone="error">{passkeyError(add.error)}</Alert>}
        {add.isSuccess && <Alert tone="success">Passkey added.</Alert>}
      </CardBody>
    </Card>
  );
}

/** The browser's own refusal (the user cancelled, no authenticator) reads as a sentence, not an exception name. */
function passkeyError(e: unknown): string {
  if (e instanceof Error && (e.name === 'NotAllowedError' || e.name === 'AbortError')) return 'The passkey was not created: the request was cancelled or timed out.';
  if (e instanceof Error && e.name === 'InvalidStateError') return 'This device already holds a passkey for your account.';
  return errorMessage(e);
}

function RecoveryCard({ status, hasFactor, onCodes }: { status: SecurityStatus; hasFactor: boolean; onCodes: (c: string[]) => void }) {
  const regenerate = useRegenerateRecoveryCodes();
  return (
    <Card aria-labelledby="recovery-title">
      <CardHeader id="recovery-title" title="Recovery codes" description="Each code signs you in once when you have neither your authenticator nor a passkey." />
      <CardBody className="space-y-3">
        <p className="text-sm text-ink-800">{hasFactor ? `${status.recoveryCodesLeft} unused recovery ${status.recoveryCodesLeft === 1 ? 'code' : 'codes'} left.` : 'Recovery codes come with your first second factor.'}</p>
        {regenerate.isError && <Alert tone="error">{errorMessage(regenerate.error)}</Alert>}
        {hasFactor && (
          <Button variant="secondary" size="sm" pending={regenerate.isPending} onClick={() => regenerate.mutate(undefined, { onSuccess: (a) => onCodes(a.recoveryCodes) })}>
            Make new recovery codes
          </Button>
        )}
      </CardBody>
    </Card>
  );
}

function OrganisationCard({ status }: { status: SecurityStatus }) {
  const set = useSetOrganisationRequirement();
  const on = status.organisation.requireSecondFactor;
  return (
    <Card aria-labelledby="org-title">
      <CardHeader id="org-title" title="Your organisation" description="As an admin you decide whether everyone in your organisation must use a second factor." />
      <CardBody className="space-y-3">
        <label className="flex items-center gap-2 text-sm text-ink-800">
          <input type="checkbox" className="size-4" checked={on} disabled={set.isPending} onChange={(e) => set.mutate({ requireSecondFactor: e.target.checked })} />
          Require a second factor for all users
        </label>
        {set.isError && <Alert tone="error">{errorMessage(set.error)}</Alert>}
      </CardBody>
    </Card>
  );
}
