import type { ClaimDetail } from '@shared/schemas/claim';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { DescriptionList } from '@/components/ui/description-list';
import { formatDate, formatDateTime } from '@/lib/format';

export function ClaimStory({ claim }: { claim: ClaimDetail }) {
  const parts = [
    { key: 'complaint', label: 'Complaint', text: claim.complaint, hint: 'What the customer reported' },
    { key: 'cause', label: 'Cause', text: claim.cause, hint: 'What the technician found' },
    { key: 'correction', label: 'Correction', text: claim.correction, hint: 'What was done to fix it' },
  ];
  return (
    <Card aria-labelledby="claim-story">
      <CardHeader id="claim-story" title="Complaint, cause and correction" />
      <CardBody className="space-y-4">
        {parts.map((p) => (
          <div key={p.key}>
            <h3 className="text-sm font-semibold text-ink-800">
              {p.label} <span className="font-normal text-ink-500">· {p.hint}</span>
            </h3>
            <p className="mt-1 whitespace-pre-line text-sm text-ink-900">{p.text?.trim() ? p.text : <span className="text-ink-500">Not written yet.</span>}</p>
          </div>
        ))}
      </CardBody>
    </Card>
  );
}

export function ClaimUnitCard({ claim }: { claim: ClaimDetail }) {
  const u = claim.unit;
  return (
    <Card aria-labelledby="claim-unit">
      <CardHeader id="claim-unit" title="Unit" />
      <CardBody>
        {u ? (
          <DescriptionList
            items={[
              { label: 'Serial number', value: <span className="font-mono">{u.serial}</span> },
              { label: 'Model', value: `${u.model.modelNumber} · ${u.model.name}` },
              { label: 'Product family', value: u.model.familyName },
              { label: 'Revision', value: u.revision },
              { label: 'Shipped', value: formatDate(u.shipDate) },
              { label: 'Installed', value: u.installDate ? formatDate(u.installDate) : 'Not recorded' },
              {
                label: 'Warranty terms',
                value: `Parts ${u.terms.partsMonths} months, labor ${u.terms.laborMonths} months, never past ${u.terms.capMonthsFromShip} months from shipping${u.terms.componentTerms.map((c) => `; ${c.label} ${c.partsMonths} months (parts only)`).join('')}. Those in force when the unit ${u.terms.basis === 'registration' ? 'was registered' : 'shipped'} (${formatDate(u.terms.basisDate)}).`,
              },
            ]}
          />
        ) : (
          <p className="text-sm text-ink-600">{claim.serial ? `Serial ${claim.serial} is not matched to a known unit.` : 'No unit chosen yet.'}</p>
        )}
      </CardBody>
    </Card>
  );
}

export function ClaimSiteCard({ claim }: { claim: ClaimDetail }) {
  const s = claim.site;
  return (
    <Card aria-labelledby="claim-site">
      <CardHeader id="claim-site" title="Site" />
      <CardBody>
        {s ? (
          <address className="text-sm not-italic text-ink-900">
            <span className="font-medium">{s.name}</span>
            <br />
            {s.addressLine}
            <br />
            {[s.city, s.region, s.postalCode].filter(Boolean).join(', ')}
          </address>
        ) : (
          <p className="text-sm text-ink-600">{claim.siteName ?? 'No site recorded.'}</p>
        )}
      </CardBody>
    </Card>
  );
}

export function ClaimDatesCard({ claim }: { claim: ClaimDetail }) {
  return (
    <Card aria-labelledby="claim-dates">
      <CardHeader id="claim-dates" title="Dates and people" />
      <CardBody>
        <DescriptionList
          items={[
            { label: 'Service agency', value: claim.agencyName },
            { label: 'Technician', value: claim.technicianName },
            { label: 'Failure date', value: formatDate(claim.failureDate) },
            { label: 'Repair date', value: formatDate(claim.repairDate) },
            { label: 'Opened', value: formatDateTime(claim.createdAt) },
            { label: 'First submitted', value: formatDateTime(claim.firstSubmittedAt) },
            ...(claim.resubmissionCount > 0 ? [{ label: 'Resubmitted', value: `${claim.resubmissionCount} time${claim.resubmissionCount === 1 ? '' : 's'}` }] : []),
            { label: 'Last submitted', value: formatDateTime(claim.submittedAt) },
            { label: 'Reviewer', value: claim.reviewerName },
            { label: 'Decided', value: formatDateTime(claim.decidedAt) },
            ...(claim.decidedByName ? [{ label: 'Decided by', value: claim.decidedByName }] : []),
            { label: 'Paid', value: formatDateTime(claim.paidAt) },
            { label: 'Pre-authorisation', value: claim.preAuthorization },
          ]}
        />
      </CardBody>
    </Card>
  );
}
