/**
 * Parts lines.
 *
 * net unit price = list price x (1 - discount), discount in basis points
 *   (1500 bps = 15 %);
 * handling is a percentage of the line's net amount, in basis points
 *   (1000 bps = 10 %), so it scales with the value of the parts handled;
 * amount = quantity x net unit price x (1 + handling), computed exactly and
 *   rounded half-up once to whole cents. The rounded net unit price is shown for
 *   reading only; the line is not computed from it.
 * Return-required parts are marked: they must be received before the claim can
 * be paid.
 */
import { CalculationInputError } from './errors';
import { mul, product, rational, toDecimalString, type Rational } from './exact';
import { roundRationalToCents } from './money';
import { money, num, rateText } from './format';
import { assertRateCents, hasText } from './labor';

export interface PartRef {
  id?: string;
  partNumber: string;
  description?: string;
  listPriceCents: number;
  returnRequired: boolean;
}

export interface PartLineInput {
  id?: string;
  part: PartRef;
  quantity: number;
}

export interface PartsContract {
  /** Discount off list price in basis points (1500 = 15 %). */
  partsDiscountBps: number;
  /** Handling added to the net line amount in basis points (1000 = 10 %). */
  handlingBps: number;
}

export interface PartLineResult {
  partNumber: string;
  quantity: number;
  listPriceCents: number;
  discountBps: number;
  handlingBps: number;
  /** Net unit price rounded to cents, for display. */
  unitNetCents: number;
  /** Exact net unit price in cents, e.g. "1699.15". */
  unitNetExactCents: string;
  /** Exact handling amount of the line in cents. */
  handlingExactCents: string;
  amountCents: number;
  returnRequired: boolean;
  rule: string;
  explanation: string[];
}

function assertBps(x: unknown, field: string, max: number): number {
  if (typeof x !== 'number' || !Number.isSafeInteger(x) || x < 0 || x > max) {
    throw new CalculationInputError(field, `${field} must be whole basis points between 0 and ${max}`);
  }
  return x;
}

export function bpsFraction(bps: number): Rational {
  return { n: BigInt(bps), d: 10_000n };
}

export function computePartLine(
  line: PartLineInput,
  contract: PartsContract,
  options: { currency?: string; field?: string } = {},
): PartLineResult {
  const f = options.field ?? 'part';
  const currency = options.currency;
  if (!line || typeof line !== 'object' || !line.part) throw new CalculationInputError(`${f}.part`, 'part line needs a part');
  if (!hasText(line.part.partNumber)) throw new CalculationInputError(`${f}.part.partNumber`, 'part needs a part number');
  const list = assertRateCents(line.part.listPriceCents, `${f}.part.listPriceCents`);
  const q = line.quantity;
  if (typeof q !== 'number' || !Number.isFinite(q) || q <= 0) {
    throw new CalculationInputError(`${f}.quantity`, `${f}.quantity must be a number above 0`);
  }
  const discountBps = assertBps(contract.partsDiscountBps, 'contract.partsDiscountBps', 10_000);
  const handlingBps = assertBps(contract.handlingBps, 'contract.handlingBps', 100_000);

  const keep: Rational = { n: BigInt(10_000 - discountBps), d: 10_000n };
  const unitNet = mul(rational(list), keep);
  const lineNet = mul(unitNet, rational(q));
  const handling = mul(lineNet, bpsFraction(handlingBps));
  const exact = product([lineNet, { n: BigInt(10_000 + handlingBps), d: 10_000n }]);
  const amountCents = roundRationalToCents(exact);
  const unitNetCents = roundRationalToCents(unitNet);
  const returnRequired = line.part.returnRequired === true;

  const explanation = [
    `List price ${money(list, currency)} less ${num(discountBps / 100, 2)} % discount = ${rateText(unitNet, currency)} net each.`,
    `${num(q)} x ${rateText(unitNet, currency)} = ${rateText(lineNet, currency)}; plus ${num(handlingBps / 100, 2)} % handling ${rateText(handling, currency)} = ${rateText(exact, currency)}, rounded half-up to ${money(amountCents, currency)}.`,
  ];
  if (returnRequired) explanation.push('Return required: the part must be received before the claim can be paid.');

  return {
    partNumber: line.part.partNumber,
    quantity: q,
    listPriceCents: list,
    discountBps,
    handlingBps,
    unitNetCents,
    unitNetExactCents: toDecimalString(unitNet, 4),
    handlingExactCents: toDecimalString(handling, 4),
    amountCents,
    returnRequired,
    rule: 'amount = quantity x list price x (1 - discount) x (1 + handling), rounded half-up once',
    explanation,
  };
}
