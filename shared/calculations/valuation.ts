/**
 * Valuation of a whole claim: coverage, labor, travel and parts combined into
 * lines, each explaining its inputs, the rule applied, the cap or term that bound
 * it and its amount; totals requested, claimed and approved; and the flags a
 * reviewer sees, each with its reason.
 *
 * - requested: the line as entered, before caps, allowances and coverage;
 * - claimed: by the rules (allowances, caps, coverage: an uncovered line is shown
 *   and valued at 0);
 * - approved: the claimed amount unless a reviewer adjusted the line (hours,
 *   quantity, distance or amount, always with a reason). A reviewer's adjustment
 *   is their decision and is not re-capped.
 * Every line amount is rounded half-up (away from zero at the tie) once, to whole
 * cents; totals are sums of line amounts.
 *
 * Travel follows labor coverage: a trip is paid when the visit's labor is
 * covered (common practice).
 */
import { CalculationInputError } from './errors';
import { computeCoverage, coverageForPart, type ComponentTerm, type CoverageResult, type CoverageTerms } from './coverage';
import { daysBetween, isWithin, parseIsoDate } from './dates';
import { FLAG_INFO, type FlagCode } from './flags';
import { filingWindow } from './filing-window';
import { money, num, rateText } from './format';
import { computeLaborLine, hasText, laborAmountExact, type LaborContract, type LaborLineInput } from './labor';
import { minorUnits, roundRationalToCents, assertCents } from './money';
import { computePartLine, type PartLineInput, type PartsContract } from './parts';
import { judgeReading, type ReadingJudgement, type ReadingSpec } from './readings';
import { computeTravel, kmToMilesExact, type LatLon, type TravelContract, type TravelInput } from './travel';
import { mul, product, rational, type Rational } from './exact';
import type { MileageRate } from './mileage';

export const REPEAT_REPAIR_WINDOW_DAYS = 90;

export const ROUNDING_RULE =
  'Each line is computed exactly and rounded half-up (away from zero at the tie) once, to whole cents; totals are sums of the rounded lines.';

export interface Certification {
  familyId: string;
  validFrom: string;
  /** Inclusive; null when open-ended. */
  validTo: string | null;
}

export interface PriorRepair {
  claimId?: string | null;
  /** Shown in the flag's reason when present (e.g. the claim number). */
  claimNumber?: string | null;
  serial: string;
  repairCode: string;
  repairDate: string;
}

export interface ValuationContract extends LaborContract, TravelContract, PartsContract {
  /** Days from the repair date within which a claim must be filed (the last day counts). */
  filingWindowDays: number;
}

export interface LineAdjustment {
  lineId: string;
  /** Approved hours (labor, travel time). */
  hours?: number | null;
  /** Approved quantity (parts). */
  quantity?: number | null;
  /** Approved round-trip distance in km (travel distance). */
  distanceKm?: number | null;
  /** Approved amount in cents; wins over the other fields. */
  amountCents?: number | null;
  reason: string;
}

export interface ValuationReading {
  id?: string;
  value: number;
  unit: string;
  spec: ReadingSpec;
}

export interface ValuationInput {
  claimId?: string | null;
  /** ISO 4217 code of the agency's currency. */
  currency: string;
  failureDate: string;
  repairDate: string;
  /** Date the claim was filed (submitted); null while a draft. */
  filedDate?: string | null;
  /** For drafts: judge the filing window as if filed on this date (e.g. today). */
  asOfDate?: string | null;
  unit: {
    serial: string;
    familyId: string;
    /** Shown in explanations; the id is used when absent. */
    familyName?: string;
    shipDate: string;
    installDate: string | null;
  };
  warrantyTerms: CoverageTerms;
  componentTerms?: ComponentTerm[];
  /** The agency's contract terms in force on the repair date. */
  contract: ValuationContract;
  technician?: { id?: string; name?: string; certifications: Certification[] } | null;
  /** Agency base and site coordinates for the travel floor check. */
  base?: LatLon | null;
  site?: LatLon | null;
  labor: LaborLineInput[];
  travel?: TravelInput | null;
  parts: PartLineInput[];
  readings?: ValuationReading[];
  priorRepairs?: PriorRepair[];
  adjustments?: LineAdjustment[];
  /** Dated mileage rates for the agency's currency, used when the contract has no rate. */
  mileageRates?: readonly MileageRate[] | null;
}

export type ValuationLineKind = 'labor' | 'travel_distance' | 'travel_time' | 'part';

export type LineInputValue = string | number | boolean | null;

export interface ValuationLine {
  id: string;
  kind: ValuationLineKind;
  description: string;
  covered: boolean;
  coverageReason: string;
  /** Payable quantity by the rules, in `quantityUnit`. */
  quantity: number;
  quantityUnit: 'h' | 'mi' | 'each';
  /** Cents per quantity unit (mileage may carry a fraction of a cent). */
  rateCents: number;
  inputs: Record<string, LineInputValue>;
  rule: string;
  /** The caps, allowances and terms that bound the line; empty when none did. */
  binding: string[];
  requestedCents: number;
  claimedCents: number;
  approvedCents: number;
  adjustment: LineAdjustment | null;
  returnRequired: boolean;
  flags: FlagCode[];
  explanation: string[];
}

export interface Totals {
  laborCents: number;
  travelCents: number;
  partsCents: number;
  totalCents: number;
}

export interface Flag {
  code: FlagCode;
  label: string;
  reason: string;
  lineIds: string[];
  scope?: 'labor' | 'parts';
}

export interface Valuation {
  currency: string;
  minorUnits: number;
  coverage: CoverageResult;
  lines: ValuationLine[];
  totals: { requested: Totals; claimed: Totals; approved: Totals };
  flags: Flag[];
  partsToReturn: { lineId: string; partNumber: string; quantity: number }[];
  readings: ReadingJudgement[];
  rounding: string;
  explanation: string[];
}

function totalsOf(lines: ValuationLine[], pick: (l: ValuationLine) => number): Totals {
  let laborCents = 0;
  let travelCents = 0;
  let partsCents = 0;
  for (const l of lines) {
    const v = pick(l);
    if (l.kind === 'labor') laborCents += v;
    else if (l.kind === 'part') partsCents += v;
    else travelCents += v;
  }
  return { laborCents, travelCents, partsCents, totalCents: laborCents + travelCents + partsCents };
}

function optionalNonNegative(x: unknown, field: string): number | null {
  if (x === undefined || x === null) return null;
  if (typeof x !== 'number' || !Number.isFinite(x) || x < 0) throw new CalculationInputError(field, `${field} must be a number, 0 or more`);
  return x;
}

/**
 * A reviewer's amount for the whole trip (lineId = the travel id, or "travel") is split over
 * the distance and time lines in proportion to their claimed amounts (requested amounts when
 * both claimed are 0): distance = total x distance / (distance + time), rounded half-up once,
 * time = total - distance, so the two lines add up to the reviewer's amount and each keeps
 * its own meaning.
 */
function splitTripAdjustments(adjustments: readonly LineAdjustment[], lines: readonly ValuationLine[], travel: TravelInput | null | undefined, currency: string): LineAdjustment[] {
  if (!travel) return [...adjustments];
  const prefix = hasText(travel.id) ? travel.id : 'travel';
  const out: LineAdjustment[] = [];
  for (const a of adjustments) {
    if (!a || typeof a !== 'object' || a.lineId !== prefix || a.amountCents === undefined || a.amountCents === null) {
      out.push(a);
      continue;
    }
    const total = assertCents(a.amountCents, 'adjustments.amountCents');
    if (total < 0) throw new CalculationInputError('adjustments.amountCents', 'an approved amount can not be negative');
    const d = lines.find((l) => l.id === `${prefix}-distance`)!;
    const t = lines.find((l) => l.id === `${prefix}-time`)!;
    let wd = d.claimedCents;
    let wt = t.claimedCents;
    if (wd + wt === 0) {
      wd = d.requestedCents;
      wt = t.requestedCents;
    }
    const distance = wd + wt === 0 ? total : roundRationalToCents({ n: BigInt(total) * BigInt(wd), d: BigInt(wd + wt) });
    const note = `${a.reason} (the reviewer's ${money(total, currency)} for the whole trip, split over distance and time in proportion to their amounts)`;
    out.push({ lineId: `${prefix}-distance`, amountCents: distance, reason: note });
    out.push({ lineId: `${prefix}-time`, amountCents: total - distance, reason: note });
  }
  return out;
}

export function valueClaim(input: ValuationInput): Valuation {
  if (!input || typeof input !== 'object') throw new CalculationInputError('input', 'valuation input is required');
  const currency = input.currency;
  const digits = minorUnits(currency);
  parseIsoDate(input.failureDate, 'failureDate');
  parseIsoDate(input.repairDate, 'repairDate');
  if (!input.unit || typeof input.unit !== 'object') throw new CalculationInputError('unit', 'unit is required');
  const contract = input.contract;
  if (!contract || typeof contract !== 'object') throw new CalculationInputError('contract', 'contract terms are required');
  if (!Array.isArray(input.labor)) throw new CalculationInputError('labor', 'labor must be a list');
  if (!Array.isArray(input.parts)) throw new CalculationInputError('parts', 'parts must be a list');

  const coverage = computeCoverage({
    failureDate: input.failureDate,
    shipDate: input.unit.shipDate,
    installDate: input.unit.installDate ?? null,
    terms: input.warrantyTerms,
    componentTerms: input.componentTerms,
  });

  const lines: ValuationLine[] = [];
  const explanation: string[] = [...coverage.explanation];
  const opts = { currency };

  // ---- labor
  const laborLines: { line: ValuationLine; multiplier: number; rateCents: number; code: string }[] = [];
  input.labor.forEach((l, i) => {
    const r = computeLaborLine(l, contract, { currency, field: `labor.${i}` });
    const id = hasText(l.id) ? l.id : `labor-${i + 1}`;
    const covered = coverage.labor.covered;
    const binding: string[] = [];
    if (r.hoursBasis === 'allowance') binding.push(`allowance of ${num(r.allowedHours)} h for repair code ${r.repairCode}`);
    if (r.hoursBasis === 'override') binding.push(`reviewer override of ${num(r.payableHours)} h`);
    if (r.flags.includes('overtime_without_authorization')) binding.push('no pre-authorisation: overtime multiplier not applied');
    if (!covered) binding.push(`labor coverage: last covered day ${coverage.labor.until}`);
    const expl = [...r.explanation];
    if (!covered) expl.push(`${coverage.labor.reason} Shown, valued at 0.`);
    const line: ValuationLine = {
      id,
      kind: 'labor',
      description: l.repairCode.description ? `${r.repairCode} ${l.repairCode.description}` : `Labor, repair code ${r.repairCode}`,
      covered,
      coverageReason: coverage.labor.reason,
      quantity: r.payableHours,
      quantityUnit: 'h',
      rateCents: r.rateCents,
      inputs: {
        repairCode: r.repairCode,
        hoursWorked: r.hoursWorked,
        allowedHours: r.allowedHours,
        overtime: l.overtime === true,
        preAuthorization: hasText(l.preAuthorization) ? l.preAuthorization.trim() : null,
        overrideHours: l.override ? l.override.hours : null,
        overrideReason: l.override ? l.override.reason : null,
        laborRateCents: r.rateCents,
        overtimeMultiplier: contract.overtimeMultiplier,
        multiplierApplied: r.multiplier,
      },
      rule: r.rule,
      binding,
      requestedCents: r.requestedCents,
      claimedCents: covered ? r.amountCents : 0,
      approvedCents: 0,
      adjustment: null,
      returnRequired: false,
      flags: [...r.flags],
      explanation: expl,
    };
    lines.push(line);
    laborLines.push({ line, multiplier: r.multiplier, rateCents: r.rateCents, code: r.repairCode });
  });

  // ---- travel
  let travelDistanceRate: Rational = { n: 0n, d: 1n };
  if (input.travel) {
    const t = computeTravel(
      input.travel,
      { base: input.base ?? null, site: input.site ?? null, repairDate: input.repairDate, mileageRates: input.mileageRates ?? null },
      contract,
      opts,
    );
    const covered = coverage.labor.covered;
    const prefix = hasText(input.travel.id) ? input.travel.id : 'travel';
    const uncoveredNote = `Travel follows labor coverage. ${coverage.labor.reason} Shown, valued at 0.`;
    travelDistanceRate = t.distance.centsPerMileExact;
    const dBinding: string[] = [];
    if (t.distance.boundBy === 'cap') dBinding.push(`contract cap of ${num(contract.maxRoundTripMiles ?? 0)} mi round trip`);
    if (!covered) dBinding.push(`labor coverage: last covered day ${coverage.labor.until}`);
    lines.push({
      id: `${prefix}-distance`,
      kind: 'travel_distance',
      description: 'Travel distance (round trip)',
      covered,
      coverageReason: coverage.labor.reason,
      quantity: t.distance.payableMiles,
      quantityUnit: 'mi',
      rateCents: t.distance.centsPerMile,
      inputs: {
        enteredRoundTripKm: t.distance.enteredKm,
        enteredRoundTripMiles: t.distance.enteredMiles,
        greatCircleKm: t.distance.greatCircleKm,
        floorKm: t.distance.floorKm,
        plausibleUpToKm: t.distance.plausibleUpToKm,
        maxRoundTripMiles: contract.maxRoundTripMiles ?? null,
        mileageRateCents: t.distance.centsPerMile,
        mileageRateSource: t.distance.rateSource,
        mileageRateNotice: t.distance.datedRate ? t.distance.datedRate.source : null,
      },
      rule: 'payable miles = min(entered round trip, contract cap); amount = miles x mileage rate (contract, else the dated rate in force on the repair date), rounded half-up once',
      binding: dBinding,
      requestedCents: t.distance.requestedCents,
      claimedCents: covered ? t.distance.amountCents : 0,
      approvedCents: 0,
      adjustment: null,
      returnRequired: false,
      flags: [...t.distance.flags],
      explanation: covered ? t.distance.explanation : [...t.distance.explanation, uncoveredNote],
    });
    const tBinding: string[] = [];
    if (t.time.boundBy === 'cap') tBinding.push(`contract cap of ${num(contract.maxTravelHours ?? 0)} h travel time`);
    if (!covered) tBinding.push(`labor coverage: last covered day ${coverage.labor.until}`);
    lines.push({
      id: `${prefix}-time`,
      kind: 'travel_time',
      description: 'Travel time',
      covered,
      coverageReason: coverage.labor.reason,
      quantity: t.time.payableHours,
      quantityUnit: 'h',
      rateCents: t.time.rateCents,
      inputs: {
        travelHours: t.time.enteredHours,
        maxTravelHours: contract.maxTravelHours ?? null,
        travelRateCents: t.time.rateCents,
      },
      rule: 'payable hours = min(entered, contract cap); amount = hours x travel rate, rounded half-up once',
      binding: tBinding,
      requestedCents: t.time.requestedCents,
      claimedCents: covered ? t.time.amountCents : 0,
      approvedCents: 0,
      adjustment: null,
      returnRequired: false,
      flags: [...t.time.flags],
      explanation: covered ? t.time.explanation : [...t.time.explanation, uncoveredNote],
    });
  }

  // ---- parts
  const partLines: { line: ValuationLine; input: PartLineInput; index: number }[] = [];
  input.parts.forEach((p, i) => {
    const r = computePartLine(p, contract, { currency, field: `parts.${i}` });
    const id = hasText(p.id) ? p.id : `part-${i + 1}`;
    const pc = coverageForPart(coverage, p.part.id);
    const binding: string[] = [];
    if (!pc.covered) binding.push(`${pc.source === 'component' ? 'component' : 'parts'} coverage: last covered day ${pc.until}`);
    const expl = [...r.explanation];
    if (pc.source === 'component') expl.push(pc.reason);
    if (!pc.covered) expl.push(`${pc.source === 'component' ? pc.reason : coverage.parts.reason} Shown, valued at 0.`);
    const line: ValuationLine = {
      id,
      kind: 'part',
      description: p.part.description ? `${r.partNumber} ${p.part.description}` : `Part ${r.partNumber}`,
      covered: pc.covered,
      coverageReason: pc.reason,
      quantity: r.quantity,
      quantityUnit: 'each',
      rateCents: r.listPriceCents,
      inputs: {
        partNumber: r.partNumber,
        quantity: r.quantity,
        listPriceCents: r.listPriceCents,
        partsDiscountBps: r.discountBps,
        handlingBps: r.handlingBps,
        unitNetCents: r.unitNetCents,
        returnRequired: r.returnRequired,
        coverageSource: pc.source,
      },
      rule: r.rule,
      binding,
      requestedCents: r.amountCents,
      claimedCents: pc.covered ? r.amountCents : 0,
      approvedCents: 0,
      adjustment: null,
      returnRequired: r.returnRequired,
      flags: [],
      explanation: expl,
    };
    lines.push(line);
    partLines.push({ line, input: p, index: i });
  });

  const seen = new Set<string>();
  for (const l of lines) {
    if (seen.has(l.id)) throw new CalculationInputError('lines', `line id "${l.id}" is used twice`);
    seen.add(l.id);
  }

  // ---- reviewer adjustments
  for (const l of lines) l.approvedCents = l.claimedCents;
  const byId = new Map(lines.map((l) => [l.id, l]));
  (splitTripAdjustments(input.adjustments ?? [], lines, input.travel, currency)).forEach((a, i) => {
    const f = `adjustments.${i}`;
    if (!a || typeof a !== 'object') throw new CalculationInputError(f, 'adjustment must be an object');
    const line = byId.get(a.lineId);
    if (!line) throw new CalculationInputError(`${f}.lineId`, `no line "${String(a.lineId)}" to adjust`);
    if (!hasText(a.reason)) throw new CalculationInputError(`${f}.reason`, 'an adjustment needs a reason');
    if (line.adjustment) throw new CalculationInputError(`${f}.lineId`, `line "${line.id}" is adjusted twice`);
    const reason = a.reason.trim();
    let approved: number;
    let text: string;
    const amount = a.amountCents;
    const hours = optionalNonNegative(a.hours, `${f}.hours`);
    const quantity = optionalNonNegative(a.quantity, `${f}.quantity`);
    const distanceKm = optionalNonNegative(a.distanceKm, `${f}.distanceKm`);
    if (amount !== undefined && amount !== null) {
      approved = assertCents(amount, `${f}.amountCents`);
      if (approved < 0) throw new CalculationInputError(`${f}.amountCents`, 'an approved amount can not be negative');
      text = `Reviewer approved ${money(approved, currency)}`;
    } else if (line.kind === 'labor' && hours !== null) {
      const ll = laborLines.find((x) => x.line === line)!;
      const exact = laborAmountExact(hours, ll.rateCents, ll.multiplier);
      approved = roundRationalToCents(exact);
      text = `Reviewer approved ${num(hours)} h: ${num(hours)} h x ${money(ll.rateCents, currency)}/h x ${num(ll.multiplier)} = ${rateText(exact, currency)}, rounded half-up to ${money(approved, currency)}`;
    } else if (line.kind === 'travel_time' && hours !== null) {
      const exact = product([hours, line.rateCents]);
      approved = roundRationalToCents(exact);
      text = `Reviewer approved ${num(hours)} h: ${num(hours)} h x ${money(line.rateCents, currency)}/h = ${rateText(exact, currency)}, rounded half-up to ${money(approved, currency)}`;
    } else if (line.kind === 'travel_distance' && distanceKm !== null) {
      const miles = kmToMilesExact(distanceKm);
      const exact = mul(miles, travelDistanceRate);
      approved = roundRationalToCents(exact);
      text = `Reviewer approved ${num(distanceKm, 1)} km (${num(miles, 4)} mi): x ${rateText(travelDistanceRate, currency)}/mi = ${rateText(exact, currency)}, rounded half-up to ${money(approved, currency)}`;
    } else if (line.kind === 'part' && quantity !== null) {
      const pl = partLines.find((x) => x.line === line)!;
      if (quantity === 0) {
        approved = 0;
        text = 'Reviewer approved a quantity of 0';
      } else {
        const r = computePartLine({ ...pl.input, quantity }, contract, { currency, field: f });
        approved = r.amountCents;
        text = `Reviewer approved a quantity of ${num(quantity)}: ${r.explanation[1]}`;
      }
    } else {
      throw new CalculationInputError(
        f,
        `adjustment of a ${line.kind.replace('_', ' ')} line needs amountCents or ${
          line.kind === 'part' ? 'quantity' : line.kind === 'travel_distance' ? 'distanceKm' : 'hours'
        }`,
      );
    }
    line.approvedCents = approved;
    line.adjustment = { ...a, reason };
    line.explanation.push(`${text} ("${reason}").`);
  });

  // ---- flags
  const flags: Flag[] = [];
  const addFlag = (code: FlagCode, reason: string, lineIds: string[] = [], scope?: 'labor' | 'parts') => {
    const flag: Flag = { code, label: FLAG_INFO[code].label, reason, lineIds };
    if (scope) flag.scope = scope;
    flags.push(flag);
  };

  const windowDays = contract.filingWindowDays;
  if (typeof windowDays !== 'number' || !Number.isSafeInteger(windowDays) || windowDays < 0) {
    throw new CalculationInputError('contract.filingWindowDays', 'contract.filingWindowDays must be a whole number of days, 0 or more');
  }
  const filedOn = input.filedDate ?? input.asOfDate ?? null;
  if (filedOn) {
    const window = filingWindow(input.repairDate, windowDays, filedOn);
    const days = window.daysAfterRepair;
    const draft = !input.filedDate;
    if (window.late) {
      addFlag(
        'filed_late',
        draft
          ? `Not yet filed; on ${filedOn} it is ${days} days after the repair on ${input.repairDate}, past the filing window of ${windowDays} days.`
          : `Filed on ${filedOn}, ${days} days after the repair on ${input.repairDate}; the filing window is ${windowDays} days.`,
      );
    } else {
      explanation.push(`Filing: ${draft ? 'as of' : 'filed on'} ${filedOn}, ${days} days after the repair, within the window of ${windowDays} days (the last day counts).`);
    }
  }

  const laborIds = lines.filter((l) => l.kind !== 'part').map((l) => l.id);
  if (!coverage.labor.covered) addFlag('out_of_coverage', coverage.labor.reason, laborIds, 'labor');
  const uncoveredParts = partLines.filter((p) => !p.line.covered);
  if (uncoveredParts.length > 0) {
    addFlag(
      'out_of_coverage',
      uncoveredParts.map((p) => `${p.line.description}: ${p.line.coverageReason}`).join(' '),
      uncoveredParts.map((p) => p.line.id),
      'parts',
    );
  } else if (partLines.length === 0 && !coverage.parts.covered) {
    addFlag('out_of_coverage', coverage.parts.reason, [], 'parts');
  }

  for (const code of [...new Set(laborLines.map((l) => l.code))]) {
    const repeats = (input.priorRepairs ?? []).filter((p, i) => {
      if (!p || typeof p !== 'object') throw new CalculationInputError(`priorRepairs.${i}`, 'prior repair must be an object');
      if (p.serial !== input.unit.serial || p.repairCode !== code) return false;
      if (input.claimId && p.claimId === input.claimId) return false;
      const d = daysBetween(p.repairDate, input.repairDate);
      return d >= 0 && d <= REPEAT_REPAIR_WINDOW_DAYS;
    });
    if (repeats.length > 0) {
      const list = repeats
        .map((p) => `${p.repairDate}${p.claimNumber ? ` (claim ${p.claimNumber})` : p.claimId ? ` (claim ${p.claimId})` : ''}, ${daysBetween(p.repairDate, input.repairDate)} days before`)
        .join('; ');
      addFlag(
        'repeat_repair',
        `Unit ${input.unit.serial} had repair code ${code} within ${REPEAT_REPAIR_WINDOW_DAYS} days before this repair on ${input.repairDate}: ${list}.`,
        laborLines.filter((l) => l.code === code).map((l) => l.line.id),
      );
      for (const l of laborLines) if (l.code === code) l.line.flags.push('repeat_repair');
    }
  }

  if (input.technician) {
    const certs = input.technician.certifications ?? [];
    const family = input.unit.familyId;
    const familyName = input.unit.familyName ?? family;
    const valid = certs.find((c, i) => {
      parseIsoDate(c.validFrom, `technician.certifications.${i}.validFrom`);
      if (c.validTo) parseIsoDate(c.validTo, `technician.certifications.${i}.validTo`);
      return c.familyId === family && isWithin(input.repairDate, c.validFrom, c.validTo ?? '9999-12-31');
    });
    const who = input.technician.name ?? input.technician.id ?? 'The technician';
    if (!valid) {
      const forFamily = certs.filter((c) => c.familyId === family);
      addFlag(
        'technician_not_certified',
        forFamily.length === 0
          ? `${who} holds no certification for product family ${familyName}.`
          : `${who}'s certification for product family ${familyName} (${forFamily
              .map((c) => `${c.validFrom} to ${c.validTo ?? 'open'}`)
              .join(', ')}) does not include the repair date ${input.repairDate}.`,
      );
    } else {
      explanation.push(`${who} is certified for product family ${familyName} from ${valid.validFrom} to ${valid.validTo ?? 'open'}, which includes the repair date.`);
    }
  }

  const gather = (code: FlagCode, describe: (l: ValuationLine) => string) => {
    const hit = lines.filter((l) => l.flags.includes(code));
    if (hit.length > 0) addFlag(code, hit.map(describe).join(' '), hit.map((l) => l.id));
  };
  gather('labor_over_allowance', (l) => `${l.description}: ${num(l.inputs.hoursWorked as number)} h worked against ${num(l.inputs.allowedHours as number)} h allowed for ${String(l.inputs.repairCode)}.`);
  gather('overtime_without_authorization', (l) => `${l.description}: overtime claimed with no pre-authorisation number; paid at the normal rate.`);
  gather('travel_over_cap', (l) =>
    l.kind === 'travel_distance'
      ? `${l.description}: ${num(l.inputs.enteredRoundTripMiles as number, 1)} mi entered, cap ${num(l.inputs.maxRoundTripMiles as number)} mi.`
      : `${l.description}: ${num(l.inputs.travelHours as number)} h entered, cap ${num(l.inputs.maxTravelHours as number)} h.`,
  );
  gather('travel_distance_implausible', (l) => `${l.description}: ${l.explanation.find((e) => e.startsWith('Below') || e.startsWith('Far above')) ?? ''}`);

  const readings: ReadingJudgement[] = (input.readings ?? []).map((r, i) => {
    if (!r || typeof r !== 'object') throw new CalculationInputError(`readings.${i}`, 'reading must be an object');
    return judgeReading({ value: r.value, unit: r.unit }, r.spec);
  });
  const failing = readings.filter((r) => r.failsAfterRepair);
  if (failing.length > 0) addFlag('readings_out_of_tolerance', failing.map((r) => r.explanation).join(' '));

  const partsToReturn = partLines
    .filter((p) => p.line.returnRequired)
    .map((p) => ({ lineId: p.line.id, partNumber: String(p.line.inputs.partNumber), quantity: p.line.quantity }));

  return {
    currency,
    minorUnits: digits,
    coverage,
    lines,
    totals: {
      requested: totalsOf(lines, (l) => l.requestedCents),
      claimed: totalsOf(lines, (l) => l.claimedCents),
      approved: totalsOf(lines, (l) => l.approvedCents),
    },
    flags,
    partsToReturn,
    readings,
    rounding: ROUNDING_RULE,
    explanation,
  };
}
