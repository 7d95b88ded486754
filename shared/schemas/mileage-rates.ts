import { z } from 'zod';
import { rangeOrder } from './messages';
import { oneLine, optionalOneLine } from './text';

/**
 * Mileage rates as the manufacturer admin keeps them: per currency (ISO 4217), per mile or
 * per kilometre, in force from..to inclusive (to null: until further notice), the rate in
 * tenths of a cent (725 = 72.5 cents) with the published source of the figure.
 */

const isoDate = z.iso.date('Use a date as YYYY-MM-DD, like 2026-03-31.');
const ISO_4217: ReadonlySet<string> = new Set(typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('currency') : ['USD', 'CAD', 'EUR', 'GBP', 'MXN']);

/** "72.5" cents → 725 tenths of a cent; digits with at most one decimal place, nothing else. */
export function parseRateCents(text: string): { ok: true; tenths: number } | { ok: false; message: string } {
  const t = text.trim();
  if (!/^\d{1,4}(?:\.\d)?$/.test(t)) return { ok: false, message: 'Enter the rate in cents with at most one decimal place, like 72.5 (no commas, no exponent).' };
  const [whole, tenth = '0'] = t.split('.');
  const tenths = Number(whole) * 10 + Number(tenth);
  if (tenths === 0) return { ok: false, message: 'A mileage rate is more than 0 cents.' };
  return { ok: true, tenths };
}

export const createMileageRateSchema = z
  .strictObject({
    currency: z
      .string('Enter a currency code, like USD.')
      .trim()
      .toUpperCase()
      .refine((c) => /^[A-Z]{3}$/.test(c) && ISO_4217.has(c), 'Use a three-letter ISO 4217 currency code, like USD or CAD.'),
    unit: z.enum(['mi', 'km'], 'Choose per mile (mi) or per kilometre (km).'),
    effectiveFrom: isoDate,
    effectiveTo: isoDate.nullable().optional(),
    /** Cents per unit as typed, like "72.5"; stored as tenths of a cent. */
    rateCents: z.union([z.string(), z.number()], 'Enter the rate in cents, like 72.5.').transform((v, ctx) => {
      const r = parseRateCents(String(v));
      if (!r.ok) {
        ctx.addIssue({ code: 'custom', message: r.message });
        return z.NEVER;
      }
      return r.tenths;
    }),
    source: oneLine({ max: 300, min: 3, label: 'The source', required: 'Name the published source of the rate, like the notice number.' }),
    reason: optionalOneLine({ max: 500, label: 'The reason' }).optional(),
  })
  .refine((v) => !v.effectiveTo || v.effectiveTo >= v.effectiveFrom, rangeOrder('effectiveFrom', 'effectiveTo', 'the first day', 'the last day'));
export type CreateMileageRateInput = z.input<typeof createMileageRateSchema>;
export type CreateMileageRateBody = z.infer<typeof createMileageRateSchema>;

/** Ends a rate: its last day in force. A last day in the past needs a reason. */
export const endMileageRateSchema = z.strictObject({
  effectiveTo: isoDate,
  reason: optionalOneLine({ max: 500, label: 'The reason' }).optional(),
});
export type EndMileageRateBody = z.infer<typeof endMileageRateSchema>;

export interface MileageRateItem {
  id: string;
  currency: string;
  unit: 'mi' | 'km';
  effectiveFrom: string;
  effectiveTo: string | null;
  rateTenthCents: number;
  source: string;
}

/** A stretch of days (inclusive) of one currency with no rate in force; `to` null: open-ended. */
export interface MileageRateGap {
  currency: string;
  from: string;
  to: string | null;
  /** Draft and filed (not yet decided) claims of the currency repaired inside the gap. */
  openClaims: number;
}

export interface MileageRatesList {
  items: MileageRateItem[];
  today: string;
  /** Currencies (of the rates or of the agencies) with no rate in force today. */
  noRateToday: string[];
  gaps: MileageRateGap[];
}

export const mileageRatesQuerySchema = z.strictObject({
  currency: z.string().trim().toUpperCase().regex(/^[A-Z]{3}$/, 'Use a three-letter currency code, like USD.').optional(),
  unit: z.enum(['mi', 'km'], 'Choose mi or km.').optional(),
});
