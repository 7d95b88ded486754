import { FLAG_CODES, type FlagCode } from '@shared/calculations/flags';

/** The review queue's filters as they sit in the URL. Amounts are in the currency's major unit. */
export interface ReviewQueueFilters {
  status?: 'submitted' | 'in_review';
  agency?: string;
  flag?: FlagCode;
  model?: string;
  min?: string;
  max?: string;
  cursor?: string;
}

const AMOUNT = /^\d{1,7}(?:\.\d{1,2})?$/;

function text(v: string | null, max: number): string | undefined {
  const t = v?.trim();
  return t ? t.slice(0, max) : undefined;
}

export function parseQueueFilters(params: URLSearchParams): ReviewQueueFilters {
  const status = params.get('status');
  const flag = params.get('flag');
  const min = params.get('min')?.trim();
  const max = params.get('max')?.trim();
  const f: ReviewQueueFilters = {
    status: status === 'submitted' || status === 'in_review' ? status : undefined,
    agency: text(params.get('agency'), 64),
    flag: flag && (FLAG_CODES as readonly string[]).includes(flag) ? (flag as FlagCode) : undefined,
    model: text(params.get('model'), 64),
    min: min && AMOUNT.test(min) ? min : undefined,
    max: max && AMOUNT.test(max) ? max : undefined,
    cursor: text(params.get('cursor'), 200),
  };
  return Object.fromEntries(Object.entries(f).filter(([, v]) => v !== undefined)) as ReviewQueueFilters;
}

export function queueFiltersToParams(f: ReviewQueueFilters): URLSearchParams {
  const p = new URLSearchParams();
  for (const k of ['status', 'agency', 'flag', 'model', 'min', 'max', 'cursor'] as const) if (f[k]) p.set(k, f[k]!);
  return p;
}

/** "12.5" dollars -> 1250 cents, exactly (no binary fractions). */
export function toCents(amount: string | undefined): number | undefined {
  if (!amount || !AMOUNT.test(amount)) return undefined;
  const [whole, frac = ''] = amount.split('.');
  return Number(whole) * 100 + Number(frac.padEnd(2, '0'));
}

/** The list API's query for the queue: submitted and in-review claims, oldest submission first. */
export function queueQuery(f: ReviewQueueFilters) {
  return {
    states: f.status ?? 'submitted,in_review',
    agency: f.agency,
    flag: f.flag,
    model: f.model,
    minCents: toCents(f.min),
    maxCents: toCents(f.max),
    cursor: f.cursor,
    sort: 'submittedAt',
    dir: 'asc',
    limit: 50,
  };
}
