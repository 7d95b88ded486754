/**
 * Warranty coverage of a unit on a failure date.
 *
 * - Terms are counted from the install date; with no install date, from the ship
 *   date plus the grace period (a stand-in for the unknown install date).
 * - A term never runs past the cap counted from the ship date.
 * - The last day is inclusive: a unit is covered ON its end date. The end date of
 *   an N-month term is the start date plus N calendar months, clamped at month
 *   ends (install 2024-01-31 + 1 month ends 2024-02-29).
 * - Coverage starts at the ship date: a unit that fails between shipping and
 *   installation (found at start-up) is covered; before the ship date it is not.
 * - A component may carry its own parts-only term, shorter or longer than the
 *   standard parts term, counted from the same start; it governs that part. Its
 *   ship-date cap moves by the same months as its term, so the unit keeps the same
 *   allowance for time between shipping and installation:
 *   component cap = ship + component months + max(0, cap months - parts months).
 */
import { CalculationInputError } from './errors';
import { addDays, addMonthsClamped, compareDates, daysBetween, parseIsoDate } from './dates';

export interface CoverageTerms {
  /** Parts term in months from the start date. */
  partsMonths: number;
  /** Labor term in months from the start date. */
  laborMonths: number;
  /** No coverage past this many months from the ship date. */
  capMonthsFromShip: number;
  /** Days after shipping that stand in for the install date when it is unknown. */
  installGraceDays: number;
}

export interface ComponentTerm {
  partId: string;
  partsMonths: number;
  label: string;
}

export interface CoverageInput {
  failureDate: string;
  shipDate: string;
  installDate: string | null;
  terms: CoverageTerms;
  componentTerms?: ComponentTerm[];
}

export type CoverageReasonCode = 'within_term' | 'term_ended' | 'ship_cap_reached' | 'before_ship_date';

export interface CoverageDecision {
  covered: boolean;
  /** Last covered day (inclusive). */
  until: string;
  months: number;
  /** start + months */
  termEnds: string;
  /** ship + cap months */
  capEnds: string;
  /** Which limit fixed `until`. */
  boundBy: 'term' | 'ship_cap';
  reasonCode: CoverageReasonCode;
  reason: string;
}

export interface ComponentCoverage extends CoverageDecision {
  partId: string;
  label: string;
  capMonths: number;
}

export type StartBasis = 'install' | 'ship_plus_grace' | 'ship';

export interface CoverageResult {
  failureDate: string;
  shipDate: string;
  installDate: string | null;
  startDate: string;
  startBasis: StartBasis;
  parts: CoverageDecision;
  labor: CoverageDecision;
  components: ComponentCoverage[];
  explanation: string[];
}

function assertMonths(n: unknown, field: string): number {
  if (typeof n !== 'number' || !Number.isSafeInteger(n) || n < 0) {
    throw new CalculationInputError(field, `${field} must be a whole number of months, 0 or more`);
  }
  return n;
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

function decide(
  what: string,
  months: number,
  capMonths: number,
  failureDate: string,
  shipDate: string,
  startDate: string,
  startText: string,
): CoverageDecision {
  const termEnds = addMonthsClamped(startDate, months);
  const capEnds = addMonthsClamped(shipDate, capMonths);
  const boundBy = compareDates(capEnds, termEnds) < 0 ? 'ship_cap' : 'term';
  const until = boundBy === 'term' ? termEnds : capEnds;
  const limitText =
    boundBy === 'term'
      ? `${plural(months, 'month')} from ${startText}`
      : `the cap of ${plural(capMonths, 'month')} from the ship date ${shipDate}, earlier than the ${plural(months, 'month')} term from ${startText}`;
  if (compareDates(failureDate, shipDate) < 0) {
    return {
      covered: false, until, months, termEnds, capEnds, boundBy,
      reasonCode: 'before_ship_date',
      reason: `${what} not covered: the failure date ${failureDate} is before the ship date ${shipDate}.`,
    };
  }
  if (compareDates(failureDate, until) <= 0) {
    return {
      covered: true, until, months, termEnds, capEnds, boundBy,
      reasonCode: 'within_term',
      reason: `${what} covered: the failure date ${failureDate} is on or before the last covered day ${until} (${limitText}; the end date itself is covered).`,
    };
  }
  const late = daysBetween(until, failureDate);
  return {
    covered: false, until, months, termEnds, capEnds, boundBy,
    reasonCode: boundBy === 'term' ? 'term_ended' : 'ship_cap_reached',
    reason: `${what} not covered: the failure date ${failureDate} is ${plural(late, 'day')} after the last covered day ${until} (${limitText}).`,
  };
}

export function computeCoverage(input: CoverageInput): CoverageResult {
  const { failureDate, shipDate, installDate, terms } = input;
  parseIsoDate(failureDate, 'failureDate');
  parseIsoDate(shipDate, 'shipDate');
  if (installDate !== null && installDate !== undefined) parseIsoDate(installDate, 'installDate');
  if (!terms || typeof terms !== 'object') throw new CalculationInputError('terms', 'warranty terms are required');
  const partsMonths = assertMonths(terms.partsMonths, 'terms.partsMonths');
  const laborMonths = assertMonths(terms.laborMonths, 'terms.laborMonths');
  const capMonths = assertMonths(terms.capMonthsFromShip, 'terms.capMonthsFromShip');
  const grace = terms.installGraceDays;
  if (typeof grace !== 'number' || !Number.isSafeInteger(grace) || grace < 0) {
    throw new CalculationInputError('terms.installGraceDays', 'terms.installGraceDays must be a whole number of days, 0 or more');
  }

  const explanation: string[] = [];
  let startDate: string;
  let startBasis: StartBasis;
  let startText: string;
  if (installDate) {
    if (compareDates(installDate, shipDate) < 0) {
      startDate = shipDate;
      startBasis = 'ship';
      startText = `the ship date ${shipDate}`;
      explanation.push(
        `The recorded install date ${installDate} is before the ship date ${shipDate}; terms are counted from the ship date.`,
      );
    } else {
      startDate = installDate;
      startBasis = 'install';
      startText = `the install date ${installDate}`;
      explanation.push(`Terms are counted from the install date ${installDate}.`);
    }
  } else {
    startDate = addDays(shipDate, grace);
    startBasis = 'ship_plus_grace';
    startText = `the ship date ${shipDate} plus ${plural(grace, 'day')} of grace (${startDate})`;
    explanation.push(
      `No install date is recorded; terms are counted from the ship date ${shipDate} plus ${plural(grace, 'day')} of grace: ${startDate}.`,
    );
  }
  explanation.push(`Coverage never runs past ${plural(capMonths, 'month')} from the ship date ${shipDate} (${addMonthsClamped(shipDate, capMonths)}).`);

  const parts = decide('Parts', partsMonths, capMonths, failureDate, shipDate, startDate, startText);
  const labor = decide('Labor', laborMonths, capMonths, failureDate, shipDate, startDate, startText);
  explanation.push(parts.reason, labor.reason);

  const components: ComponentCoverage[] = (input.componentTerms ?? []).map((c, i) => {
    if (!c || typeof c.partId !== 'string' || c.partId === '') {
      throw new CalculationInputError(`componentTerms.${i}.partId`, 'component term needs a part id');
    }
    const months = assertMonths(c.partsMonths, `componentTerms.${i}.partsMonths`);
    const label = typeof c.label === 'string' && c.label !== '' ? c.label : c.partId;
    const componentCap = months + Math.max(0, capMonths - partsMonths);
    const d = decide(`${label} (parts only)`, months, componentCap, failureDate, shipDate, startDate, startText);
    explanation.push(d.reason);
    return { ...d, partId: c.partId, label, capMonths: componentCap };
  });

  return { failureDate, shipDate, installDate: installDate ?? null, startDate, startBasis, parts, labor, components, explanation };
}

export interface PartCoverage {
  covered: boolean;
  until: string;
  source: 'standard' | 'component';
  reason: string;
}

/**
 * Parts coverage for one part: a component term governs its part, whether it is shorter or
 * longer than the standard parts term (a 6-month gasket on a 24-month model is covered for
 * 6 months, a 60-month heating element for 60). Parts without a component term follow the
 * standard parts term.
 */
export function coverageForPart(coverage: CoverageResult, partId: string | null | undefined): PartCoverage {
  const component = partId ? coverage.components.find((c) => c.partId === partId) : undefined;
  if (component) return { covered: component.covered, until: component.until, source: 'component', reason: component.reason };
  return { covered: coverage.parts.covered, until: coverage.parts.until, source: 'standard', reason: coverage.parts.reason };
}
