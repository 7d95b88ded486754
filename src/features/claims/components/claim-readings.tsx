import type { ClaimDetail } from '@shared/schemas/claim';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';

const unitLabels: Record<string, string> = { F: '°F', C: '°C', in: 'in', mm: 'mm', A: 'A', V: 'V' };

function readingName(key: string): string {
  const spaced = key.replace(/[_-]+/g, ' ').trim();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

/** Readings as entered, before and after the repair side by side. */
export function ClaimReadings({ claim }: { claim: ClaimDetail }) {
  const keys = [...new Set(claim.readings.map((r) => r.key))];
  const find = (key: string, phase: 'before' | 'after') => claim.readings.filter((r) => r.key === key && r.phase === phase);
  const show = (key: string, phase: 'before' | 'after') => {
    const rs = find(key, phase);
    return rs.length ? rs.map((r) => `${r.value.toLocaleString('en-US')} ${unitLabels[r.unit] ?? r.unit}`).join(', ') : '—';
  };
  return (
    <Card aria-labelledby="claim-readings">
      <CardHeader id="claim-readings" title="Readings" description="Measured on site, in the unit the technician used." />
      {keys.length === 0 ? (
        <CardBody className="text-sm text-ink-600">No readings entered.</CardBody>
      ) : (
        <Table caption="Readings before and after the repair">
          <THead>
            <Tr>
              <Th>Reading</Th>
              <Th className="text-right">Before repair</Th>
              <Th className="text-right">After repair</Th>
            </Tr>
          </THead>
          <TBody>
            {keys.map((key) => (
              <Tr key={key}>
                <Th scope="row" className="font-medium">
                  {readingName(key)}
                </Th>
                <Td className="text-right tabular-nums">{show(key, 'before')}</Td>
                <Td className="text-right tabular-nums">{show(key, 'after')}</Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
    </Card>
  );
}
