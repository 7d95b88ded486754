import { Link } from 'react-router';
import { claimStateLabels } from '@shared/schemas/claim';
import type { UnitLookup } from '@shared/schemas/unit';
import { DescriptionList } from '@/components/ui/description-list';
import { paths } from '@/config/paths';
import { formatDate } from '@/lib/format';
import { CoveragePanel } from './coverage-panel';

/** The unit's own terms in words: those in force when it shipped or was registered. */
export function unitTermsText(terms: UnitLookup['terms']): string {
  const parts = [`Parts ${terms.partsMonths} months, labor ${terms.laborMonths} months, never past ${terms.capMonthsFromShip} months from shipping`];
  for (const c of terms.componentTerms) parts.push(`${c.label} ${c.partsMonths} months (parts only)`);
  const since = terms.effectiveFrom === '0001-01-01' ? 'the model\'s terms' : `the model's terms from ${formatDate(terms.effectiveFrom)}`;
  return `${parts.join('; ')}. Fixed by ${since}, in force when the unit ${terms.basis === 'registration' ? 'was registered' : 'shipped'} (${formatDate(terms.basisDate)}).`;
}

/** What the serial found: model, revision, site, dates, coverage on the day, earlier claims. */
export function UnitCard({ lookup }: { lookup: UnitLookup }) {
  const { unit, model, family, site, coverage, on, priorClaims, terms } = lookup;
  return (
    <div className="space-y-4" aria-label={`Unit ${unit.serial}`} role="group">
      <div>
        <p className="text-lg font-semibold text-ink-900">
          <span className="font-mono">{model.modelNumber}</span> · {model.name}
        </p>
        <p className="text-sm text-ink-700">
          {family.name} · {family.fuel === 'gas' ? 'gas' : 'electric'}
        </p>
      </div>
      <DescriptionList
        items={[
          { label: 'Serial number', value: <span className="font-mono">{unit.serial}</span> },
          { label: 'Revision', value: unit.revision },
          { label: 'Site', value: site ? `${site.name}, ${site.addressLine}, ${site.city} ${site.region} ${site.postalCode}` : 'No site on record' },
          { label: 'Installed', value: unit.installDate ? formatDate(unit.installDate) : `Not recorded (ship date plus ${model.installGraceDays} days stands in)` },
          { label: 'Shipped', value: formatDate(unit.shipDate) },
          { label: 'Warranty terms', value: unitTermsText(terms) },
        ]}
      />
      <CoveragePanel coverage={coverage} on={on} />
      {priorClaims.length > 0 && (
        <section aria-label="Earlier claims on this unit" className="text-sm">
          <p className="font-medium text-ink-800">Earlier claims on this unit</p>
          <ul className="mt-1 space-y-1">
            {priorClaims.slice(0, 5).map((c) => (
              <li key={c.id}>
                <Link to={paths.claim(c.id)} className="font-mono text-ink-800 underline underline-offset-2">
                  {c.number}
                </Link>{' '}
                · {claimStateLabels[c.state]} · repaired {formatDate(c.repairDate)}
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
