import { describe, expect, it } from 'vitest';
import { render, screen, within } from '@testing-library/react';
import type { ClaimReadingsReport, JudgedReadingView } from '@shared/schemas/evidence';
import { ReadingsReport } from './readings-report';

const spec = { key: 'oil', label: 'Oil temperature', unit: 'F', unitLabel: '°F', nominal: 350, tolerance: 5, low: 345, high: 355, phase: 'both' as const, requiredForCodes: ['X-1'] };
const reading = (phase: 'before' | 'after', value: number, unit: string, convertedValue: number, pass: boolean): JudgedReadingView => ({
  id: `${phase}`,
  key: 'oil',
  label: 'Oil temperature',
  phase,
  value,
  unit,
  kind: 'spec',
  convertedValue,
  deviation: convertedValue - 350,
  pass,
  direction: pass ? 'within' : convertedValue < 350 ? 'low' : 'high',
  failsAfterRepair: phase === 'after' && !pass,
  explanation: 'x',
  spec,
});

describe('ReadingsReport', () => {
  const report: ClaimReadingsReport = {
    modelNumber: 'M-1',
    fuel: 'gas',
    specs: [{ ...spec, required: true }],
    readings: [
      reading('before', 330, 'F', 330, false),
      reading('after', 180, 'C', 356, false),
      { ...reading('after', 157, 'F', 157, true), key: 'core_temp_ground_beef', kind: 'food', label: 'Core', spec: null, explanation: 'Comminuted meat: core 157 °F meets 155 °F for 17 s (FDA Food Code §3-401.11(A)(2)). For information only.' },
    ],
    foodKeys: [],
  };

  it('shows each reading with its conversion and pass/fail, before and after', () => {
    render(<ReadingsReport report={report} />);
    const table = screen.getByRole('table');
    const row = within(table).getByRole('row', { name: /Oil temperature/ });
    expect(row).toHaveTextContent('350 ± 5 °F');
    expect(row).toHaveTextContent('180 °C = 356 °F');
    expect(within(row).getByText('Fail: low')).toBeInTheDocument();
    expect(within(row).getByText('Fail: high')).toBeInTheDocument();
  });

  it('draws the tolerance band and both readings, the after one marked outside', () => {
    render(<ReadingsReport report={report} />);
    const chart = screen.getByTestId('reading-chart-oil');
    expect(chart).toHaveAttribute('aria-label', expect.stringContaining('tolerance band 345 to 355 °F'));
    expect(chart).toHaveAttribute('aria-label', expect.stringContaining('after repair 356 (outside)'));
    const band = chart.querySelector('[data-band="tolerance"]')!;
    const after = chart.querySelector('[data-phase="after"]')!;
    const bandRight = Number(band.getAttribute('x')) + Number(band.getAttribute('width'));
    expect(Number(after.getAttribute('cx'))).toBeGreaterThan(bandRight);
    expect(after.getAttribute('fill')).toBe('#b91c1c');
    const before = chart.querySelector('[data-phase="before"]')!;
    expect(Number(before.getAttribute('cx'))).toBeLessThan(Number(band.getAttribute('x')));
  });

  it('lists the product core temperature as information against the FDA Food Code', () => {
    render(<ReadingsReport report={report} />);
    const food = screen.getByRole('region', { name: 'Product core temperature' });
    expect(food).toHaveTextContent('Meets the FDA Food Code minimum');
    expect(food).toHaveTextContent('§3-401.11(A)(2)');
  });
});
