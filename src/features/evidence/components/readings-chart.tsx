import type { JudgedReadingView } from '@shared/schemas/evidence';

export interface ChartRow {
  key: string;
  label: string;
  unitLabel: string;
  nominal: number;
  low: number;
  high: number;
  before: JudgedReadingView | undefined;
  after: JudgedReadingView | undefined;
}

const W = 320;
const H = 56;
const PAD = 14;

const fmt = (x: number) => Number(x.toFixed(3)).toLocaleString('en-US');

/**
 * One reading against its tolerance band: the band shaded, the nominal as a line, the value
 * before the repair as a hollow circle and after as a filled one (red when outside the band).
 * Values are drawn in the spec's unit, converted on the server with exact factors.
 */
export function ReadingChart({ row }: { row: ChartRow }) {
  const values = [row.before?.convertedValue, row.after?.convertedValue].filter((v): v is number => typeof v === 'number');
  const span = Math.max(row.high - row.low, 1e-9);
  const min = Math.min(row.low - span * 0.5, ...values);
  const max = Math.max(row.high + span * 0.5, ...values);
  const x = (v: number) => PAD + ((v - min) / (max - min || 1)) * (W - 2 * PAD);
  const describe = [
    `${row.label}: tolerance band ${fmt(row.low)} to ${fmt(row.high)} ${row.unitLabel}, nominal ${fmt(row.nominal)}`,
    row.before?.convertedValue != null ? `before repair ${fmt(row.before.convertedValue)} (${row.before.pass ? 'within' : 'outside'})` : 'no reading before repair',
    row.after?.convertedValue != null ? `after repair ${fmt(row.after.convertedValue)} (${row.after.pass ? 'within' : 'outside'})` : 'no reading after repair',
  ].join('; ');
  const point = (r: JudgedReadingView | undefined, filled: boolean) => {
    if (r?.convertedValue == null) return null;
    const ok = r.pass === true;
    const color = ok ? '#047857' : filled ? '#b91c1c' : '#c2410c';
    return (
      <g>
        <circle cx={x(r.convertedValue)} cy={H / 2} r={6} fill={filled ? color : '#ffffff'} stroke={color} strokeWidth={2.5} data-phase={filled ? 'after' : 'before'} />
        <text x={x(r.convertedValue)} y={H / 2 - 10} fontSize={10} textAnchor="middle" fill="#102c2a">
          {fmt(r.convertedValue)}
        </text>
      </g>
    );
  };
  return (
    <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={describe} className="h-14 w-full max-w-sm" data-testid={`reading-chart-${row.key}`}>
      <line x1={PAD} x2={W - PAD} y1={H / 2} y2={H / 2} stroke="#a9d2cc" strokeWidth={1} />
      <rect x={x(row.low)} y={H / 2 - 9} width={Math.max(1, x(row.high) - x(row.low))} height={18} fill="#d5e9e6" stroke="#46948b" strokeWidth={1} data-band="tolerance" />
      <line x1={x(row.nominal)} x2={x(row.nominal)} y1={H / 2 - 12} y2={H / 2 + 12} stroke="#1a4c48" strokeWidth={1.5} strokeDasharray="3 2" />
      <text x={x(row.low)} y={H - 2} fontSize={9} textAnchor="middle" fill="#2a776f">
        {fmt(row.low)}
      </text>
      <text x={x(row.high)} y={H - 2} fontSize={9} textAnchor="middle" fill="#2a776f">
        {fmt(row.high)}
      </text>
      {point(row.before, false)}
      {point(row.after, true)}
    </svg>
  );
}
