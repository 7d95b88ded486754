import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { Alert } from '@/components/ui/alert';
import { errorMessage } from '@/lib/api-client';
import { useClaimReadings } from '../api/get-claim-readings';
import { ReadingsReport } from './readings-report';

/** Readings of the claim with pass/fail in the spec's unit and a chart of each against its band. */
export function ReadingsPanel({ claimId }: { claimId: string }) {
  const report = useClaimReadings(claimId);
  return (
    <Card aria-labelledby={`readings-${claimId}`}>
      <CardHeader id={`readings-${claimId}`} title="Readings" description={report.data?.modelNumber ? `Judged against the specification of model ${report.data.modelNumber}.` : undefined} />
      <CardBody>
        {report.isPending ? <Spinner label="Loading the readings…" /> : report.isError ? <Alert tone="error">{errorMessage(report.error)}</Alert> : <ReadingsReport report={report.data} />}
      </CardBody>
    </Card>
  );
}
