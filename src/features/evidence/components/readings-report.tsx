import type { ClaimReadingsReport, JudgedReadingView } from '@shared/schemas/evidence';
import { Badge } from '@/components/ui/badge';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { ReadingChart, type ChartRow } from './readings-chart';

const unitLabels: Record<string, string> = { F: '°F', C: '°C', in: 'in', mm: 'mm', A: 'A', V: 'V' };
const fmt = (x: number) => Number(x.toFixed(3)).toLocaleString('en-US');

function Verdict({ r }: { r: JudgedReadingView | undefined }) {
  if (!r) return <span className="text-ink-600">—</span>;
  const converted = r.spec && r.unit !== r.spec.unit && r.convertedValue != null ? ` = ${fmt(r.convertedValue)} ${r.spec.unitLabel}` : '';
  const badge =
    r.pass === null ? (
      <Badge tone="slate">Not judged</Badge>
    ) : r.pass ? (
      <Badge tone="green">Pass</Badge>
    ) : (
      <Badge tone={r.phase === 'after' ? 'red' : 'orange'}>{r.direction === 'low' ? 'Fail: low' : r.direction === 'high' ? 'Fail: high' : 'Fail'}</Badge>
    );
  return (
    <span className="flex flex-col items-end gap-0.5" title={r.explanation}>
      <span className="tabular-nums">
        {fmt(r.value)} {unitLabels[r.unit] ?? r.unit}
        <span className="text-ink-600">{converted}</span>
      </span>
      {badge}
    </span>
  );
}

/** The claim's readings judged against the model's specs: a table with pass/fail and a chart per reading. */
export function ReadingsReport({ report }: { report: ClaimReadingsReport }) {
  const specKeys = report.specs.map((s) => s.key);
  const judged = report.readings.filter((r) => r.kind !== 'food');
  const food = report.readings.filter((r) => r.kind === 'food');
  const keys = [...new Set([...specKeys.filter((k) => judged.some((r) => r.key === k)), ...judged.map((r) => r.key)])];
  const find = (key: string, phase: 'before' | 'after') => judged.find((r) => r.key === key && r.phase === phase);
  if (keys.length === 0 && food.length === 0) return <p className="text-sm text-ink-600">No readings entered.</p>;
  return (
    <div className="space-y-4">
      {keys.length > 0 && (
        <Table caption="Readings judged against the model's specification">
          <THead>
            <Tr>
              <Th>Reading</Th>
              <Th>Specification</Th>
              <Th className="text-right">Before repair</Th>
              <Th className="text-right">After repair</Th>
            </Tr>
          </THead>
          <TBody>
            {keys.map((key) => {
              const spec = report.specs.find((s) => s.key === key);
              const b = find(key, 'before');
              const a = find(key, 'after');
              return (
                <Tr key={key}>
                  <Th scope="row" className="font-medium">
                    {spec?.label ?? b?.label ?? a?.label ?? key}
                    {spec?.required && <span className="ml-1 text-xs text-ink-600">(required)</span>}
                  </Th>
                  <Td className="tabular-nums">{spec ? `${fmt(spec.nominal)} ± ${fmt(spec.tolerance)} ${spec.unitLabel}` : '—'}</Td>
                  <Td className="text-right">
                    <Verdict r={b} />
                  </Td>
                  <Td className="text-right">
                    <Verdict r={a} />
                  </Td>
                </Tr>
              );
            })}
          </TBody>
        </Table>
      )}
      {keys.some((k) => report.specs.some((s) => s.key === k)) && (
        <div className="space-y-2" aria-label="Readings against their tolerance bands">
          <p className="text-xs text-ink-600">Band: tolerance; dashed line: nominal; ○ before repair, ● after repair (red when outside).</p>
          <ul className="grid gap-2 sm:grid-cols-2">
            {keys.map((key) => {
              const spec = report.specs.find((s) => s.key === key);
              if (!spec) return null;
              const row: ChartRow = { key, label: spec.label, unitLabel: spec.unitLabel, nominal: spec.nominal, low: spec.low, high: spec.high, before: find(key, 'before'), after: find(key, 'after') };
              return (
                <li key={key}>
                  <p className="text-xs font-medium text-ink-800">
                    {spec.label} ({spec.unitLabel})
                  </p>
                  <ReadingChart row={row} />
                </li>
              );
            })}
          </ul>
        </div>
      )}
      {food.length > 0 && (
        <section aria-label="Product core temperature" className="rounded-md border border-ink-100 bg-ink-50 px-3 py-2 text-sm">
          <h3 className="font-semibold text-ink-900">Product core temperature after the cook cycle (for information)</h3>
          <ul className="mt-1 space-y-1">
            {food.map((r) => (
              <li key={r.key} className="flex flex-wrap items-center gap-2">
                <Badge tone={r.pass ? 'green' : 'orange'}>{r.pass ? 'Meets the FDA Food Code minimum' : 'Below the FDA Food Code minimum'}</Badge>
                <span className="text-ink-800">{r.explanation}</span>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
