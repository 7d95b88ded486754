/**
 * Builds the inputs of the shared computation (valuation, submit validation, workflow facts)
 * from the database rows of one claim. Reads only; the caller has already checked the scope.
 */
import { and, asc, desc, eq, gte, inArray, isNull, lte, ne, notInArray, or } from 'drizzle-orm';
import type { Db } from '../../db/client';
import {
  agencyTerms,
  attachments,
  certifications,
  claimLaborLines,
  claimPartLines,
  claimReadings,
  claimTravel,
  claims,
  componentTerms,
  mileageRates,
  models,
  organisations,
  parts,
  productFamilies,
  readingSpecs,
  repairCodes,
  sites,
  units,
  users,
  type Claim,
} from '../../db/schema/index';
import { valueClaim, type LineAdjustment, type Valuation, type ValuationInput } from '@shared/calculations/valuation';
import { isCalculationInputError } from '@shared/calculations/errors';
import { KM_PER_MILE } from '@shared/calculations/travel';
import type { MileageRate } from '@shared/calculations/mileage';
import { areCompatible } from '@shared/calculations/units';
import { businessDay, DEFAULT_TIME_ZONE } from '@shared/calculations/business-day';
import { validateForSubmit, type SubmitFacts, type SubmitValidation } from '@shared/workflow/submit-validation';
import type { ClaimFacts } from '@shared/workflow/claim-machine';
import { allowancesOn, pricesOn, unitTermsOf } from '../admin/catalog.queries';

export interface BuildProblem {
  path: string;
  message: string;
}

export interface ClaimInputs {
  claim: Claim;
  /** The agency's IANA time zone: its business days (filing date, today) are counted in it. */
  timeZone: string;
  unit: { id: string; serial: string; shipDate: string; installDate: string | null; registeredOn: string | null; modelId: string; familyId: string; familyName: string; partsMonths: number; laborMonths: number; capMonthsFromShip: number; installGraceDays: number } | null;
  site: { latitude: number; longitude: number } | null;
  base: { latitude: number; longitude: number } | null;
  terms: typeof agencyTerms.$inferSelect | null;
  components: { partId: string; partsMonths: number; label: string }[];
  labor: Array<typeof claimLaborLines.$inferSelect & { code: string; description: string; allowedHours: number; requiredEvidence: string[] }>;
  travel: typeof claimTravel.$inferSelect | null;
  parts: Array<typeof claimPartLines.$inferSelect & { partNumber: string; description: string; listPriceCents: number; returnRequired: boolean }>;
  readings: Array<typeof claimReadings.$inferSelect & { spec: typeof readingSpecs.$inferSelect | null }>;
  specs: (typeof readingSpecs.$inferSelect)[];
  attachmentRoles: string[];
  technician: { id: string; name: string; certifications: { familyId: string; validFrom: string; validTo: string | null }[] };
  priorRepairs: { claimId: string; claimNumber: string; serial: string; repairCode: string; repairDate: string }[];
  /** The dated mileage rates of the claim's currency (a small table, read whole). */
  mileageRates: MileageRate[];
}

/** Loads every row the computation of one claim needs, in a handful of indexed reads. */
export function loadClaimInputs(db: Db, claim: Claim): ClaimInputs {
  const unit = claim.unitId
    ? (db
        .select({
          id: units.id,
          serial: units.serial,
          shipDate: units.shipDate,
          installDate: units.installDate,
          registeredOn: units.registeredOn,
          modelId: models.id,
          familyId: models.familyId,
          familyName: productFamilies.name,
          partsMonths: models.partsMonths,
          laborMonths: models.laborMonths,
          capMonthsFromShip: models.capMonthsFromShip,
          installGraceDays: models.installGraceDays,
        })
        .from(units)
        .innerJoin(models, eq(models.id, units.modelId))
        .innerJoin(productFamilies, eq(productFamilies.id, models.familyId))
        .where(eq(units.id, claim.unitId))
        .get() ?? null)
    : null;
  const site = claim.siteId ? (db.select({ latitude: sites.latitude, longitude: sites.longitude }).from(sites).where(eq(sites.id, claim.siteId)).get() ?? null) : null;
  const agency = db.select({ latitude: organisations.latitude, longitude: organisations.longitude, timeZone: organisations.timeZone }).from(organisations).where(eq(organisations.id, claim.agencyId)).get();
  const base = agency && agency.latitude !== null && agency.longitude !== null ? { latitude: agency.latitude, longitude: agency.longitude } : null;

  const terms = claim.repairDate
    ? (db
        .select()
        .from(agencyTerms)
        .where(and(eq(agencyTerms.agencyId, claim.agencyId), lte(agencyTerms.effectiveFrom, claim.repairDate), or(isNull(agencyTerms.effectiveTo), gte(agencyTerms.effectiveTo, claim.repairDate))))
        .orderBy(desc(agencyTerms.effectiveFrom))
        .get() ?? null)
    : null;

  // the unit's own terms: the model's terms in force when it shipped (or was registered)
  const unitTerms = unit ? unitTermsOf(db, unit) : null;
  if (unit && unitTerms) {
    unit.partsMonths = unitTerms.partsMonths;
    unit.laborMonths = unitTerms.laborMonths;
    unit.capMonthsFromShip = unitTerms.capMonthsFromShip;
    unit.installGraceDays = unitTerms.installGraceDays;
  }
  const components = unitTerms ? unitTerms.componentTerms.map(({ partId, partsMonths, label }) => ({ partId, partsMonths, label })) : [];

  const labor = db
    .select({
      line: claimLaborLines,
      code: repairCodes.code,
      description: repairCodes.description,
      allowedHours: repairCodes.allowedHours,
      requiredEvidence: repairCodes.requiredEvidence,
    })
    .from(claimLaborLines)
    .innerJoin(repairCodes, eq(repairCodes.id, claimLaborLines.repairCodeId))
    .where(eq(claimLaborLines.claimId, claim.id))
    .orderBy(asc(claimLaborLines.position))
    .all()
    .map((r) => ({ ...r.line, code: r.code, description: r.description, allowedHours: r.allowedHours, requiredEvidence: r.requiredEvidence ?? [] }));

  // allowances and list prices in force on the repair date (effective-dated catalogue)
  if (claim.repairDate) {
    const hours = allowancesOn(db, [...new Set(labor.map((l) => l.repairCodeId))], claim.repairDate);
    for (const l of labor) l.allowedHours = hours.get(l.repairCodeId) ?? l.allowedHours;
  }

  const travel = db.select().from(claimTravel).where(eq(claimTravel.claimId, claim.id)).get() ?? null;

  const partRows = db
    .select({ line: claimPartLines, partNumber: parts.partNumber, description: parts.description, listPriceCents: parts.listPriceCents, returnRequired: parts.returnRequired })
    .from(claimPartLines)
    .innerJoin(parts, eq(parts.id, claimPartLines.partId))
    .where(eq(claimPartLines.claimId, claim.id))
    .orderBy(asc(claimPartLines.position))
    .all()
    .map((r) => ({ ...r.line, partNumber: r.partNumber, description: r.description, listPriceCents: r.listPriceCents, returnRequired: r.returnRequired }));

  if (claim.repairDate) {
    const prices = pricesOn(db, [...new Set(partRows.map((p) => p.partId))], claim.repairDate);
    for (const p of partRows) p.listPriceCents = prices.get(p.partId) ?? p.listPriceCents;
  }

  const specs = unit ? db.select().from(readingSpecs).where(eq(readingSpecs.modelId, unit.modelId)).all() : [];
  const specByKey = new Map(specs.map((s) => [s.key, s]));
  const readings = db
    .select()
    .from(claimReadings)
    .where(eq(claimReadings.claimId, claim.id))
    .all()
    .map((r) => ({ ...r, spec: specByKey.get(r.key) ?? null }));

  // retracted evidence no longer counts towards the roles the repair codes require
  const attachmentRoles = db.select({ role: attachments.role }).from(attachments).where(and(eq(attachments.claimId, claim.id), isNull(attachments.retractedAt))).all().map((a) => a.role);

  const tech = db.select({ id: users.id, name: users.name }).from(users).where(eq(users.id, claim.technicianId)).get();
  const certs = db
    .select({ familyId: certifications.familyId, validFrom: certifications.validFrom, validTo: certifications.validTo })
    .from(certifications)
    // a revoked certificate no longer counts
    .where(and(eq(certifications.userId, claim.technicianId), isNull(certifications.revokedAt)))
    .all();

  const codes = [...new Set(labor.map((l) => l.code))];
  const priorRepairs =
    unit && codes.length > 0
      ? db
          .select({ claimId: claims.id, claimNumber: claims.number, serial: units.serial, repairCode: repairCodes.code, repairDate: claims.repairDate })
          .from(claims)
          .innerJoin(units, eq(units.id, claims.unitId))
          .innerJoin(claimLaborLines, eq(claimLaborLines.claimId, claims.id))
          .innerJoin(repairCodes, eq(repairCodes.id, claimLaborLines.repairCodeId))
          .where(and(eq(claims.unitId, unit.id), ne(claims.id, claim.id), notInArray(claims.state, ['draft', 'withdrawn']), inArray(repairCodes.code, codes)))
          .all()
          .filter((r): r is { claimId: string; claimNumber: string; serial: string; repairCode: string; repairDate: string } => r.repairDate !== null)
      : [];

  const rates: MileageRate[] = db
    .select({ effectiveFrom: mileageRates.effectiveFrom, effectiveTo: mileageRates.effectiveTo, currency: mileageRates.currency, unit: mileageRates.unit, rateTenthCents: mileageRates.rateTenthCents, source: mileageRates.source })
    .from(mileageRates)
    .where(eq(mileageRates.currency, claim.currency))
    .orderBy(asc(mileageRates.effectiveFrom))
    .all();

  return {
    claim,
    timeZone: agency?.timeZone ?? DEFAULT_TIME_ZONE,
    unit,
    site,
    base,
    terms,
    components,
    labor,
    travel,
    parts: partRows,
    readings,
    specs,
    attachmentRoles,
    technician: { id: claim.technicianId, name: tech?.name ?? '', certifications: certs },
    priorRepairs,
    mileageRates: rates,
  };
}

/**
 * "Today" for the computation: a business day as given ('YYYY-MM-DD'), or an instant read as
 * the day it is in the agency's time zone.
 */
export type AsOf = string | Date;
export const agencyDayOf = (inputs: Pick<ClaimInputs, 'timeZone'>, asOf: AsOf): string => (typeof asOf === 'string' ? asOf : businessDay(asOf, inputs.timeZone));

const hasText = (s: string | null | undefined): s is string => typeof s === 'string' && s.trim() !== '';

/** Miles as stored, to the kilometres the computation takes, without binary noise. */
export function milesToKm(miles: number): number {
  return Number((miles * KM_PER_MILE).toFixed(9));
}

/**
 * Reviewer adjustments as stored on the lines. Before approval, an adjustment is a value with
 * a reason (hours or amount on labor, quantity or amount on parts, an amount for the whole trip
 * on travel); the amounts frozen at approval carry no reason and are not adjustments.
 */
export function adjustmentsOf(inputs: ClaimInputs): { adjustments: LineAdjustment[]; halfMade: string[] } {
  const adjustments: LineAdjustment[] = [];
  const halfMade: string[] = [];
  inputs.labor.forEach((l, i) => {
    const reason = hasText(l.adjustmentReason) ? l.adjustmentReason : null;
    if (l.approvedHours !== null && reason) adjustments.push({ lineId: l.id, hours: l.approvedHours, reason });
    else if (l.approvedHours !== null) halfMade.push(`laborLines.${i}`);
    else if (reason && l.approvedAmountCents !== null) adjustments.push({ lineId: l.id, amountCents: l.approvedAmountCents, reason });
    else if (reason) halfMade.push(`laborLines.${i}`);
  });
  inputs.parts.forEach((p, i) => {
    const reason = hasText(p.adjustmentReason) ? p.adjustmentReason : null;
    if (p.approvedQuantity !== null && reason) adjustments.push({ lineId: p.id, quantity: p.approvedQuantity, reason });
    else if (p.approvedQuantity !== null) halfMade.push(`partLines.${i}`);
    else if (reason && p.approvedAmountCents !== null) adjustments.push({ lineId: p.id, amountCents: p.approvedAmountCents, reason });
    else if (reason) halfMade.push(`partLines.${i}`);
  });
  const t = inputs.travel;
  if (t) {
    const reason = hasText(t.adjustmentReason) ? t.adjustmentReason : null;
    if (reason && t.approvedAmountCents !== null) {
      // one amount for the whole trip: the valuation splits it over distance and time
      adjustments.push({ lineId: t.id, amountCents: t.approvedAmountCents, reason });
    } else if (reason) halfMade.push('travel');
  }
  return { adjustments, halfMade };
}

/**
 * The valuation input, or the problems that keep the claim from being valued yet (no unit,
 * no dates, no contract terms in force on the repair date).
 */
export function valuationInputOf(inputs: ClaimInputs, asOf: AsOf): { input: ValuationInput | null; problems: BuildProblem[] } {
  const { claim, unit, terms } = inputs;
  const today = agencyDayOf(inputs, asOf);
  const problems: BuildProblem[] = [];
  if (!unit) problems.push({ path: 'serial', message: 'Find the unit by its serial number to value the claim.' });
  if (!claim.failureDate) problems.push({ path: 'failureDate', message: 'Enter the failure date to value the claim.' });
  if (!claim.repairDate) problems.push({ path: 'repairDate', message: 'Enter the repair date to value the claim.' });
  if (claim.repairDate && !terms) problems.push({ path: 'repairDate', message: `No contract terms of the agency are in force on the repair date ${claim.repairDate}.` });
  if (problems.length > 0 || !unit || !terms || !claim.failureDate || !claim.repairDate) return { input: null, problems };

  const { adjustments } = adjustmentsOf(inputs);
  const input: ValuationInput = {
    claimId: claim.id,
    currency: claim.currency,
    failureDate: claim.failureDate,
    repairDate: claim.repairDate,
    filedDate: claim.firstSubmittedAt ? businessDay(claim.firstSubmittedAt, inputs.timeZone) : null, // the agency's day of the first filing
    asOfDate: claim.firstSubmittedAt ? null : today,
    unit: { serial: unit.serial, familyId: unit.familyId, familyName: unit.familyName, shipDate: unit.shipDate, installDate: unit.installDate },
    warrantyTerms: { partsMonths: unit.partsMonths, laborMonths: unit.laborMonths, capMonthsFromShip: unit.capMonthsFromShip, installGraceDays: unit.installGraceDays },
    componentTerms: inputs.components,
    contract: {
      laborRateCents: terms.laborRateCents,
      overtimeMultiplier: terms.overtimeMultiplier,
      travelRateCents: terms.travelRateCents,
      mileageRateCents: terms.mileageRateCents,
      maxRoundTripMiles: terms.maxRoundTripMiles,
      maxTravelHours: terms.maxTravelHours,
      partsDiscountBps: terms.partsDiscountBps,
      handlingBps: terms.partsHandlingBps,
      filingWindowDays: terms.filingWindowDays,
    },
    technician: inputs.technician,
    base: inputs.base ? { lat: inputs.base.latitude, lon: inputs.base.longitude } : null,
    site: inputs.site ? { lat: inputs.site.latitude, lon: inputs.site.longitude } : null,
    labor: inputs.labor.map((l) => ({
      id: l.id,
      repairCode: { code: l.code, allowedHours: l.allowedHours, description: l.description },
      hoursWorked: l.hoursWorked,
      overtime: l.overtime,
      preAuthorization: claim.preAuthorization,
    })),
    travel: inputs.travel ? { id: inputs.travel.id, enteredRoundTripKm: milesToKm(inputs.travel.roundTripMiles), travelHours: inputs.travel.travelHours } : null,
    parts: inputs.parts.map((p) => ({
      id: p.id,
      part: { id: p.partId, partNumber: p.partNumber, description: p.description, listPriceCents: p.listPriceCents, returnRequired: p.returnRequired },
      quantity: p.quantity,
    })),
    readings: inputs.readings
      .filter((r) => r.spec !== null && areCompatible(r.unit, r.spec.unit))
      .map((r) => ({ id: r.id, value: r.value, unit: r.unit, spec: { unit: r.spec!.unit, nominal: r.spec!.nominal, tolerance: r.spec!.tolerance, phase: r.phase, label: r.spec!.label } })),
    priorRepairs: inputs.priorRepairs,
    adjustments,
    mileageRates: inputs.mileageRates,
  };
  return { input, problems };
}

export interface ClaimValuationResult {
  valuation: Valuation | null;
  problems: BuildProblem[];
}

/** Values the claim; malformed stored input comes back as problems, never as a thrown error. */
export function valueFromInputs(inputs: ClaimInputs, asOf: AsOf): ClaimValuationResult {
  const { input, problems } = valuationInputOf(inputs, asOf);
  if (!input) return { valuation: null, problems };
  try {
    return { valuation: valueClaim(input), problems: [] };
  } catch (e) {
    if (isCalculationInputError(e)) return { valuation: null, problems: [{ path: e.field, message: e.message }] };
    throw e;
  }
}

/** The input builder for one claim id (reads only). */
export function buildValuationInput(db: Db, claimId: string, asOf: AsOf): { input: ValuationInput | null; problems: BuildProblem[] } {
  const claim = db.select().from(claims).where(eq(claims.id, claimId)).get();
  if (!claim) return { input: null, problems: [{ path: 'id', message: 'No such claim.' }] };
  return valuationInputOf(loadClaimInputs(db, claim), asOf);
}

/** The facts the submit guard checks. */
export function submitFactsOf(inputs: ClaimInputs, asOf: AsOf, valuationProblems: BuildProblem[] = []): SubmitFacts {
  const codes = new Set(inputs.labor.map((l) => l.code));
  const requiredReadings: Array<{ key: string; label: string; phase: 'before' | 'after' }> = [];
  for (const s of inputs.specs) {
    if (!s.requiredForCodes.some((c) => codes.has(c))) continue;
    const phases: Array<'before' | 'after'> = s.phase === 'both' ? ['before', 'after'] : [s.phase];
    for (const phase of phases) requiredReadings.push({ key: s.key, label: s.label, phase });
  }
  const c = inputs.claim;
  return {
    unitId: inputs.unit?.id ?? null,
    failureDate: c.failureDate,
    repairDate: c.repairDate,
    today: agencyDayOf(inputs, asOf),
    complaint: c.complaint,
    cause: c.cause,
    correction: c.correction,
    laborLines: inputs.labor.map((l) => ({ repairCode: l.code, requiredEvidence: l.requiredEvidence })),
    partLines: inputs.parts.map((p) => ({ partId: p.partId })),
    attachments: inputs.attachmentRoles.map((role) => ({ role })),
    requiredReadings,
    readings: inputs.readings.map((r) => ({ key: r.key, phase: r.phase })),
    shipDate: inputs.unit?.shipDate ?? null,
    contractTermsInForce: c.repairDate ? inputs.terms !== null : undefined,
    valuationProblems,
  };
}

/**
 * Lines without a decided amount. A line is decided when the valuation computes an amount for
 * it (the computed amount is accepted unless a reviewer adjusts it) or a reviewer adjustment
 * carries both a value and a reason. So lines are undecided when the claim cannot be valued
 * (every line), or a stored adjustment is half made.
 */
export function undecidedLinesOf(inputs: ClaimInputs, result: ClaimValuationResult): string[] {
  const { halfMade } = adjustmentsOf(inputs);
  if (result.valuation) return halfMade;
  const all = [...inputs.labor.map((_, i) => `laborLines.${i}`), ...(inputs.travel ? ['travel'] : []), ...inputs.parts.map((_, i) => `partLines.${i}`)];
  return all.length > 0 ? all : ['valuation'];
}

export interface ClaimEvaluation {
  inputs: ClaimInputs;
  validation: SubmitValidation;
  valuation: ClaimValuationResult;
  facts: ClaimFacts;
}

/** Everything the workflow guards need for one claim, from its rows. */
export function evaluateClaim(db: Db, claim: Claim, asOf: AsOf): ClaimEvaluation {
  const inputs = loadClaimInputs(db, claim);
  const today = agencyDayOf(inputs, asOf);
  const valuation = valueFromInputs(inputs, today);
  // problems of the computation itself (the facts were complete but a rule had no data, e.g. no mileage rate in force)
  const computeProblems = !valuation.valuation && valuationInputOf(inputs, today).input ? valuation.problems : [];
  const validation = validateForSubmit(submitFactsOf(inputs, today, computeProblems));
  return { inputs, validation, valuation, facts: { validation, undecidedLines: undecidedLinesOf(inputs, valuation) } };
}
