import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';

/** Recovery codes, shown once: the user confirms they kept them before going on. */
export function RecoveryCodesList({ codes, onDone, doneLabel = 'Continue' }: { codes: string[]; onDone: () => void; doneLabel?: string }) {
  const [kept, setKept] = useState(false);
  return (
    <section aria-label="Recovery codes" className="space-y-4">
      <Alert tone="warning" title="Keep these recovery codes">
        Each code signs you in once when you do not have your authenticator. They are shown only now: print them or keep them in a password manager.
      </Alert>
      <ol className="grid grid-cols-2 gap-2 rounded-md border border-ink-100 bg-ink-50 p-3 font-mono text-sm text-ink-900" aria-label="Your recovery codes">
        {codes.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ol>
      <label className="flex items-center gap-2 text-sm text-ink-800">
        <input type="checkbox" checked={kept} onChange={(e) => setKept(e.target.checked)} className="size-4" />I have kept these codes somewhere safe
      </label>
      <Button className="w-full" disabled={!kept} onClick={onDone}>
        {doneLabel}
      </Button>
    </section>
  );
}
