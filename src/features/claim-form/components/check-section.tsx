import type { SubmitProblem } from '@shared/workflow/submit-validation';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { focusField } from '../form-model';

function ProblemList({ problems }: { problems: ReadonlyArray<Pick<SubmitProblem, 'path' | 'message'>> }) {
  return (
    <ul className="space-y-1.5 text-sm">
      {problems.map((p) => (
        <li key={p.path + p.message} className="flex gap-2">
          <span aria-hidden="true" className="text-red-700">
            •
          </span>
          <a
            href={`#${p.path}`}
            className="text-ink-900 underline decoration-ink-300 underline-offset-2 hover:decoration-ink-700"
            onClick={(e) => {
              e.preventDefault();
              focusField(p.path);
            }}
          >
            {p.message}
          </a>
        </li>
      ))}
    </ul>
  );
}

/**
 * The check step: every problem the shared submit validation finds, each a link to its
 * field; then submit (or resubmit, with the same number) once nothing is left.
 */
export function CheckSection({
  problems,
  serverProblems,
  canSubmit,
  submitting,
  saving,
  resubmit,
  number,
  error,
  onSubmit,
}: {
  problems: readonly SubmitProblem[];
  serverProblems: ReadonlyArray<{ path: string; message: string }>;
  /** The claim's allowed actions include submit (the stored claim passes the server's check). */
  canSubmit: boolean;
  submitting: boolean;
  saving: boolean;
  resubmit: boolean;
  number: string;
  error: string | null;
  onSubmit: () => void;
}) {
  const ready = problems.length === 0;
  return (
    <Card aria-labelledby="section-check-title" id="section-check">
      <CardHeader
        id="section-check-title"
        title={resubmit ? 'Check and resubmit' : 'Check and submit'}
        description={resubmit ? `A resubmitted claim keeps its number, ${number}.` : 'The same check the manufacturer runs when the claim arrives.'}
      />
      <CardBody className="space-y-4">
        {ready ? (
          <p className="flex items-center gap-2 text-sm font-medium text-emerald-800">
            <span aria-hidden="true">✓</span> Nothing missing: the claim is ready to {resubmit ? 'resubmit' : 'submit'}.
          </p>
        ) : (
          <div className="space-y-2">
            <p className="text-sm font-medium text-ink-900">
              {problems.length === 1 ? 'One thing to finish' : `${problems.length} things to finish`} before submitting:
            </p>
            <ProblemList problems={problems} />
          </div>
        )}
        {serverProblems.length > 0 && (
          <Alert tone="error" title="The server’s check found these">
            <ProblemList problems={serverProblems} />
          </Alert>
        )}
        {error && <Alert tone="error">{error}</Alert>}
        <div className="flex flex-wrap items-center gap-3">
          <Button onClick={onSubmit} disabled={!ready || (!canSubmit && !saving)} pending={submitting}>
            {resubmit ? `Resubmit ${number}` : 'Submit the claim'}
          </Button>
          {ready && !canSubmit && saving && <span className="text-sm text-ink-600">Saving first…</span>}
          {ready && !canSubmit && !saving && <span className="text-sm text-ink-600">Not yet accepted by the server’s check; the latest changes may still be saving.</span>}
        </div>
      </CardBody>
    </Card>
  );
}
