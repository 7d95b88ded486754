import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { Alert } from '@/components/ui/alert';
import { errorMessage } from '@/lib/api-client';
import { plural } from '@/lib/format';
import { useClaimEvidence } from '../api/get-claim-evidence';
import { EvidenceCautions } from './evidence-cautions';
import { EvidenceFlags } from './evidence-flags';
import { EvidenceGallery } from './evidence-gallery';
import { EvidenceUploader } from './evidence-uploader';

/**
 * The claim's evidence: the gallery and the checks for everyone who may read the claim, and the
 * uploader while the claim is editable. `bare` drops the card, for use inside a form section.
 */
export function EvidencePanel({
  claimId,
  editable,
  retractable = false,
  gas = false,
  bare = false,
  onImported,
}: {
  claimId: string;
  editable: boolean;
  /** The claim is filed and this user is of its agency: files may be retracted with a reason. */
  retractable?: boolean;
  gas?: boolean;
  bare?: boolean;
  onImported?: () => void;
}) {
  const evidence = useClaimEvidence(claimId);
  const body = (
    <div className="space-y-4">
      {editable && (
        <>
          <EvidenceCautions gas={gas} />
          <EvidenceUploader claimId={claimId} onImported={onImported} maxFileBytes={evidence.data?.limits.maxFileBytes} />
        </>
      )}
      {evidence.isPending ? (
        <Spinner label="Loading the evidence…" />
      ) : evidence.isError ? (
        <Alert tone="error">{errorMessage(evidence.error)}</Alert>
      ) : (
        <>
          <EvidenceFlags flags={evidence.data.flags} />
          <EvidenceGallery attachments={evidence.data.attachments} flags={evidence.data.flags} claimId={claimId} manage={editable ? 'edit' : retractable ? 'retract' : null} />
        </>
      )}
    </div>
  );
  if (bare) return body;
  const n = evidence.data?.attachments.length ?? 0;
  return (
    <Card aria-labelledby={`evidence-${claimId}`}>
      <CardHeader id={`evidence-${claimId}`} title="Evidence" description={n ? plural(n, 'file') : undefined} />
      <CardBody>{body}</CardBody>
    </Card>
  );
}
