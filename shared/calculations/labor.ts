/**
 * Labor lines.
 *
 * payable hours = min(hours worked, the repair code's allowed hours), unless a
 * reviewer override with a reason gives the hours instead;
 * amount = payable hours x labor rate x overtime multiplier, where the multiplier
 * applies only to an overtime line carrying a pre-authorisation number;
 * the exact product is rounded half-up once, to whole cents.
 */
import { CalculationInputError } from './errors';
import { product, type Rational } from './exact';
import { roundRationalToCents } from './money';
import { money, num, rateText } from './format';

export interface RepairCodeRef {
  code: string;
  allowedHours: number;
  description?: string;
}

export interface LaborOverride {
  hours: number;
  reason: string;
}

export interface LaborLineInput {
  id?: string;
  repairCode: RepairCodeRef;
  /** Decimal hours, e.g. 1.25 */
  hoursWorked: number;
  overtime: boolean;
  preAuthorization?: string | null;
  override?: LaborOverride | null;
}

export interface LaborContract {
  /** Cents per hour. */
  laborRateCents: number;
  /** e.g. 1.5 */
  overtimeMultiplier: number;
}

export type LaborFlagCode = 'labor_over_allowance' | 'overtime_without_authorization';

export interface LaborLineResult {
  repairCode: string;
  hoursWorked: number;
  allowedHours: number;
  payableHours: number;
  hoursBasis: 'worked' | 'allowance' | 'override';
  rateCents: number;
  /** Multiplier applied to the payable amount (1 unless authorised overtime). */
  multiplier: number;
  overtimeApplied: boolean;
  /** Hours worked x rate x the multiplier asked for, before the allowance and authorisation rules. */
  requestedCents: number;
  /** Payable amount by the rules. */
  amountCents: number;
  flags: LaborFlagCode[];
  rule: string;
  explanation: string[];
}

export function assertNonNegative(x: unknown, field: string): number {
  if (typeof x !== 'number' || !Number.isFinite(x) || x < 0) {
    throw new CalculationInputError(field, `${field} must be a number, 0 or more`);
  }
  return x === 0 ? 0 : x;
}

export function assertRateCents(x: unknown, field: string): number {
  if (typeof x !== 'number' || !Number.isSafeInteger(x) || x < 0) {
    throw new CalculationInputError(field, `${field} must be a whole number of cents, 0 or more`);
  }
  return x;
}

export function hasText(s: unknown): s is string {
  return typeof s === 'string' && s.trim() !== '';
}

/** Exact amount (before rounding) of hours x rate x multiplier. */
export function laborAmountExact(hours: number, rateCents: number, multiplier: number): Rational {
  return product([hours, rateCents, multiplier]);
}

export function computeLaborLine(
  line: LaborLineInput,
  contract: LaborContract,
  options: { currency?: string; field?: string } = {},
): LaborLineResult {
  const f = options.field ?? 'labor';
  const currency = options.currency;
  if (!line || typeof line !== 'object') throw new CalculationInputError(f, 'labor line is required');
  if (!line.repairCode || !hasText(line.repairCode.code)) {
    throw new CalculationInputError(`${f}.repairCode`, 'labor line needs a repair code');
  }
  const hoursWorked = assertNonNegative(line.hoursWorked, `${f}.hoursWorked`);
  const allowedHours = assertNonNegative(line.repairCode.allowedHours, `${f}.repairCode.allowedHours`);
  const rateCents = assertRateCents(contract.laborRateCents, 'contract.laborRateCents');
  const overtimeMultiplier = assertNonNegative(contract.overtimeMultiplier, 'contract.overtimeMultiplier');
  if (overtimeMultiplier < 1) {
    throw new CalculationInputError('contract.overtimeMultiplier', 'contract.overtimeMultiplier must be 1 or more');
  }
  const code = line.repairCode.code;
  const explanation: string[] = [];
  const flags: LaborFlagCode[] = [];

  let payableHours: number;
  let hoursBasis: LaborLineResult['hoursBasis'];
  const override = line.override ?? null;
  if (override) {
    const h = assertNonNegative(override.hours, `${f}.override.hours`);
    if (!hasText(override.reason)) {
      throw new CalculationInputError(`${f}.override.reason`, 'an override of labor hours needs a reason');
    }
    payableHours = h;
    hoursBasis = 'override';
    explanation.push(
      `Hours worked ${num(hoursWorked)} h; allowance for ${code} ${num(allowedHours)} h; reviewer override sets ${num(h)} h ("${override.reason.trim()}").`,
    );
  } else if (hoursWorked > allowedHours) {
    payableHours = allowedHours;
    hoursBasis = 'allowance';
    explanation.push(
      `Hours worked ${num(hoursWorked)} h exceed the allowance for ${code} of ${num(allowedHours)} h; the allowance binds: ${num(allowedHours)} h payable.`,
    );
  } else {
    payableHours = hoursWorked;
    hoursBasis = 'worked';
    explanation.push(`Hours worked ${num(hoursWorked)} h, within the allowance for ${code} of ${num(allowedHours)} h.`);
  }
  if (hoursWorked > allowedHours) flags.push('labor_over_allowance');

  const authorised = hasText(line.preAuthorization);
  let multiplier = 1;
  let overtimeApplied = false;
  if (line.overtime) {
    if (authorised) {
      multiplier = overtimeMultiplier;
      overtimeApplied = true;
      explanation.push(`Overtime with pre-authorisation ${String(line.preAuthorization).trim()}: multiplier ${num(multiplier)}.`);
    } else {
      flags.push('overtime_without_authorization');
      explanation.push(`Overtime claimed without a pre-authorisation number: paid at the normal rate (multiplier 1).`);
    }
  }

  const exact = laborAmountExact(payableHours, rateCents, multiplier);
  const amountCents = roundRationalToCents(exact);
  const requestedCents = roundRationalToCents(laborAmountExact(hoursWorked, rateCents, line.overtime ? overtimeMultiplier : 1));
  explanation.push(
    `${num(payableHours)} h x ${money(rateCents, currency)}/h x ${num(multiplier)} = ${rateText(exact, currency)}, rounded half-up to ${money(amountCents, currency)}.`,
  );
  return {
    repairCode: code,
    hoursWorked,
    allowedHours,
    payableHours,
    hoursBasis,
    rateCents,
    multiplier,
    overtimeApplied,
    requestedCents,
    amountCents,
    flags,
    rule: 'payable hours = min(hours worked, allowance) unless overridden with a reason; amount = hours x rate x overtime multiplier (only with pre-authorisation), rounded half-up once',
    explanation,
  };
}
