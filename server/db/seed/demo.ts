/**
 * The demo scenario: one manufacturer, two service agencies, a catalogue, restaurants,
 * units, and claims in every workflow state with a consistent audit trail and payment runs.
 *
 * Reproducible: every choice comes from a seeded generator and every date is an offset
 * from `today`, so the same `today` gives the same scenario (row ids aside) and the demo
 * never looks stale. Amounts stored here are close to what the valuation computes; the
 * server's own valuation is the authority and recomputes them.
 */
import { count } from 'drizzle-orm';
import { addDays, addMonthsClamped, daysBetween, isIsoDate, minDate } from '@shared/calculations/dates';
import { convert } from '@shared/calculations/units';
import type { FlagCode } from '@shared/calculations/flags';
import { roleLabels, type Role } from '@shared/permissions/ability';
import { tx, type Db } from '../client';
import {
  agencyTerms,
  certifications,
  claimCounters,
  claimEvents,
  claimLaborLines,
  claimPartLines,
  claimReadings,
  claims,
  claimTravel,
  comments,
  componentTerms,
  models,
  organisations,
  parts,
  paymentRunItems,
  paymentRuns,
  productFamilies,
  readingSpecs,
  repairCodes,
  sites,
  units,
  totpCredentials,
  users,
  type ClaimStateValue,
} from '../schema/index';
import { newTotpSecret } from '../../lib/totp';
import { rolesRequiringSecondFactor } from '@shared/schemas/second-factor';
import { hashPassword } from '../../lib/passwords';
import { newId } from '../../lib/ids';
import { createRandom, type Random } from './random';
import {
  agencySeeds,
  certificationSeeds,
  CHAIN_NAME,
  denialSeeds,
  familySeeds,
  manufacturerSeed,
  modelSeeds,
  partSeeds,
  repairCodeSeeds,
  returnReasonSeeds,
  siteSeeds,
  termsSeeds,
  userSeeds,
  type AgencyKey,
  type FamilyCode,
  type ModelSeed,
  type ReadingSpecSeed,
  type RepairCodeSeed,
  type TermsSeed,
} from './demo-data';
import { settleSeededAmounts } from './settle';
import { nameKey } from '@shared/schemas/text';

/**
 * Every demo account signs in with this password. It is shorter than the 15-character
 * minimum of the password policy on purpose: the seed writes the hash directly and so
 * bypasses the policy, for these invented demo accounts only. Real accounts always go
 * through the policy (invitation and reset flows).
 */
export const DEMO_PASSWORD = 'fieldproof-demo';

/** Fixed so the scenario is the same on every run. */
const SEED = 0x0f1e1d;

export interface SeedOptions {
  pepper: string;
  bcryptCost: number;
  /** YYYY-MM-DD; every date of the scenario is counted back from it. */
  today: string;
}

export interface SeedSummary {
  organisations: number;
  agencyTerms: number;
  users: number;
  certifications: number;
  productFamilies: number;
  models: number;
  readingSpecs: number;
  componentTerms: number;
  parts: number;
  repairCodes: number;
  sites: number;
  units: number;
  claims: number;
  claimsByState: Record<ClaimStateValue, number>;
  claimEvents: number;
  comments: number;
  paymentRuns: number;
}

/** True when nothing has been seeded: there is no organisation at all. */
export function isEmpty(db: Db): boolean {
  const [row] = db.select({ n: count() }).from(organisations).all();
  return (row?.n ?? 0) === 0;
}

// ---------------------------------------------------------------------------------------
// Time helpers (UTC). Timestamps are handled as epoch milliseconds while planning.

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const dayStart = (date: string): number => Date.parse(`${date}T00:00:00.000Z`);
const iso = (ms: number): string => new Date(ms).toISOString();
const dateOf = (ms: number): string => iso(ms).slice(0, 10);
const yearOfMs = (ms: number): number => new Date(ms).getUTCFullYear();
const round = (x: number, places: number): number => {
  const f = 10 ** places;
  return Math.round(x * f) / f;
};
const cents = (x: number): number => Math.round(x);

/** Great-circle distance in miles (haversine, IUGG mean Earth radius 6371.0088 km). */
function greatCircleMiles(lat1: number, lon1: number, lat2: number, lon2: number): number {
  const rad = Math.PI / 180;
  const dLat = (lat2 - lat1) * rad;
  const dLon = (lon2 - lon1) * rad;
  const a = Math.sin(dLat / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(dLon / 2) ** 2;
  const km = 2 * 6371.0088 * Math.asin(Math.min(1, Math.sqrt(a)));
  return km / 1.609344;
}

/**
 * IRS business standard mileage rate in cents per mile, used only to estimate the claimed
 * amount of agencies whose terms defer to it: 2023 65.5 (IRS Notice 2023-03), 2024 67
 * (Notice 2024-08), 2025 70 (Notice 2025-5), 2026 72.5 (Notice 2026-10, recalled).
 */
function estimatedIrsMileageCents(year: number): number {
  const table: Record<number, number> = { 2023: 65.5, 2024: 67, 2025: 70, 2026: 72.5 };
  if (table[year] !== undefined) return table[year];
  return year < 2023 ? 65.5 : 72.5;
}

// ---------------------------------------------------------------------------------------
// Scenario plan

type Variant =
  | 'normal'
  | 'no_unit'
  | 'late'
  | 'uncertified'
  | 'repeat'
  | 'repeat_source'
  | 'after_out'
  | 'overtime'
  | 'travel_cap'
  | 'with_comment'
  | 'old_terms'
  | 'returned_once'
  | 'awaiting'
  | 'shipped'
  | 'received'
  | 'received_open_run'
  | 'none_open_run'
  | 'adjusted'
  | keyof typeof returnReasonSeeds
  | keyof typeof denialSeeds
  | 'from_draft'
  | 'from_returned';

interface Scenario {
  state: ClaimStateValue;
  agency: AgencyKey;
  variant: Variant;
  /** Failure happened this many days before today (inclusive range). */
  age: [number, number];
}

const AGES: Record<ClaimStateValue, [number, number]> = {
  draft: [2, 12],
  submitted: [4, 20],
  in_review: [8, 30],
  returned: [12, 40],
  approved: [15, 60],
  denied: [15, 80],
  paid: [40, 125],
  withdrawn: [10, 70],
};

const sc = (state: ClaimStateValue, agency: AgencyKey, variant: Variant = 'normal', age?: [number, number]): Scenario => ({
  state,
  agency,
  variant,
  age: age ?? AGES[state],
});

/** Paid first: later claims (the repeat repair) refer back to them. 48 claims in all. */
const SCENARIOS: Scenario[] = [
  sc('paid', 'harborview', 'repeat_source', [40, 55]),
  sc('paid', 'harborview'),
  sc('paid', 'harborview', 'returned_once'),
  sc('paid', 'harborview', 'old_terms', [106, 125]),
  sc('paid', 'harborview'),
  sc('paid', 'harborview', 'overtime'),
  sc('paid', 'prairie'),
  sc('paid', 'prairie', 'returned_once'),
  sc('paid', 'prairie', 'old_terms', [106, 125]),
  sc('paid', 'prairie'),
  sc('paid', 'prairie', 'returned_once'),
  sc('paid', 'prairie', 'travel_cap'),
  sc('approved', 'harborview', 'awaiting'),
  sc('approved', 'harborview', 'received_open_run'),
  sc('approved', 'harborview', 'none_open_run'),
  sc('approved', 'harborview', 'received_open_run'),
  sc('approved', 'prairie', 'shipped'),
  sc('approved', 'prairie', 'received'),
  sc('approved', 'prairie', 'awaiting'),
  sc('approved', 'prairie', 'adjusted'),
  sc('denied', 'harborview', 'out_of_coverage'),
  sc('denied', 'prairie', 'filed_late', [72, 80]),
  sc('denied', 'harborview', 'liquid_damage'),
  sc('denied', 'prairie', 'installation_fault'),
  sc('returned', 'harborview', 'missing_evidence'),
  sc('returned', 'prairie', 'readings_missing'),
  sc('returned', 'harborview', 'labor_over_guide'),
  sc('returned', 'prairie', 'incomplete_information'),
  sc('in_review', 'harborview', 'with_comment'),
  sc('in_review', 'prairie'),
  sc('in_review', 'harborview', 'overtime'),
  sc('in_review', 'prairie', 'with_comment'),
  sc('in_review', 'harborview', 'travel_cap'),
  sc('submitted', 'harborview'),
  sc('submitted', 'prairie'),
  sc('submitted', 'harborview', 'late', [48, 55]),
  sc('submitted', 'prairie', 'uncertified'),
  sc('submitted', 'harborview', 'repeat'),
  sc('submitted', 'prairie', 'after_out'),
  sc('draft', 'harborview'),
  sc('draft', 'prairie'),
  sc('draft', 'harborview', 'no_unit'),
  sc('draft', 'prairie'),
  sc('draft', 'harborview'),
  sc('withdrawn', 'harborview', 'from_draft'),
  sc('withdrawn', 'prairie', 'from_draft'),
  sc('withdrawn', 'harborview', 'from_returned'),
  sc('withdrawn', 'prairie', 'from_returned'),
];

interface UnitPlan {
  id: string;
  serial: string;
  model: ModelSeed;
  modelId: string;
  family: FamilyCode;
  revision: string;
  shipDate: string;
  installDate: string | null;
  siteIndex: number;
}

interface EventPlan {
  type: string;
  from: ClaimStateValue | null;
  to: ClaimStateValue | null;
  actor: string;
  at: number;
  reason?: string;
  comment?: string;
}

interface PartLinePlan {
  part: (typeof partSeeds)[number];
  quantity: number;
  claimedCents: number;
  returnStatus: 'not_required' | 'awaiting' | 'shipped' | 'received';
  shippedAt?: number;
  receivedAt?: number;
  trackingNumber?: string;
}

interface LaborLinePlan {
  code: RepairCodeSeed;
  hoursWorked: number;
  overtime: boolean;
  note: string;
  approvedHours?: number;
  adjustmentReason?: string;
  approvedCents?: number;
}

interface ReadingPlan {
  spec: ReadingSpecSeed;
  phase: 'before' | 'after';
  value: number;
  unit: string;
}

interface ClaimPlan {
  id: string;
  scenario: Scenario;
  number: string;
  agency: AgencyKey;
  technician: string;
  reviewer: string | null;
  unit: UnitPlan | null;
  complaint: string;
  cause: string;
  correction: string;
  failureDate: string | null;
  repairDate: string | null;
  preAuthorization: string | null;
  labor: LaborLinePlan[];
  travel: { miles: number; hours: number; claimedCents: number; approvedCents?: number } | null;
  partLines: PartLinePlan[];
  readings: ReadingPlan[];
  events: EventPlan[];
  comments: { author: string; body: string; at: number }[];
  claimedTotalCents: number;
  approved?: { labor: number; travel: number; parts: number; total: number };
  flags: FlagCode[];
  terms: TermsSeed | null;
  /** When the claim may go into a payment run (approved and every return received). */
  readyAt?: number;
  paidAt?: number;
}

const sumOf = (xs: number[]): number => xs.reduce((s, x) => s + x, 0);

function termsFor(agency: AgencyKey, date: string, today: string): TermsSeed {
  for (const t of termsSeeds[agency]) {
    const from = addDays(today, -t.fromDaysAgo);
    const to = t.toDaysFromToday === null ? null : addDays(today, t.toDaysFromToday);
    if (date >= from && (to === null || date <= to)) return t;
  }
  return termsSeeds[agency][1];
}

function coverageOn(unit: UnitPlan, failureDate: string): { parts: boolean; labor: boolean } {
  const m = unit.model;
  const start = unit.installDate ?? addDays(unit.shipDate, m.installGraceDays);
  const cap = addMonthsClamped(unit.shipDate, m.capMonthsFromShip);
  const partsEnd = minDate(addMonthsClamped(start, m.partsMonths), cap);
  const laborEnd = minDate(addMonthsClamped(start, m.laborMonths), cap);
  return { parts: failureDate <= partsEnd, labor: failureDate <= laborEnd };
}

function inTolerance(spec: ReadingSpecSeed, value: number, unit: string): boolean {
  const v = unit === spec.unit ? value : convert(value, unit, spec.unit);
  return Math.abs(v - spec.nominal) <= spec.tolerance + 1e-9;
}

/** A reading as a technician would enter it: sometimes in °C or mm, rounded like a meter shows it. */
function enteredReading(rng: Random, spec: ReadingSpecSeed, valueInSpecUnit: number): { value: number; unit: string } {
  if (spec.unit === 'F') {
    if (rng.chance(0.2)) return { value: round(convert(valueInSpecUnit, 'F', 'C') * 2, 0) / 2, unit: 'C' };
    return { value: Math.round(valueInSpecUnit), unit: 'F' };
  }
  if (spec.unit === 'in') {
    if (spec.key === 'platen_gap' && rng.chance(0.25)) return { value: round(convert(valueInSpecUnit, 'in', 'mm'), 2), unit: 'mm' };
    return { value: round(valueInSpecUnit, spec.tolerance < 0.1 ? 3 : 2), unit: 'in' };
  }
  if (spec.unit === 'A') return { value: round(valueInSpecUnit, 2), unit: 'A' };
  return { value: Math.round(valueInSpecUnit), unit: spec.unit };
}

// ---------------------------------------------------------------------------------------

export function seedDemo(db: Db, opts: SeedOptions): SeedSummary {
  const { today } = opts;
  if (!isIsoDate(today)) throw new Error(`seedDemo: today must be a date as YYYY-MM-DD, got "${String(today)}"`);
  if (!isEmpty(db)) throw new Error('seedDemo: the database already holds data; start from an empty database');

  const rng = createRandom(SEED);
  const todayMs = dayStart(today);
  /** Nothing in the scenario happens later than half an hour before today starts (UTC). */
  const limit = todayMs - 30 * 60_000;
  const daysAgo = (n: number): string => addDays(today, -n);
  const stamp = (n: number, hour = 15): string => iso(dayStart(daysAgo(n)) + hour * HOUR);
  const catalogCreated = stamp(900);

  // Passwords are hashed once, before the transaction (bcrypt is slow by design).
  const passwordHash = hashPassword(DEMO_PASSWORD, opts.pepper, opts.bcryptCost);

  // --- organisations and terms -----------------------------------------------------------
  const manufacturerId = newId();
  const agencyId: Record<AgencyKey, string> = { harborview: newId(), prairie: newId() };
  const orgRows: (typeof organisations.$inferInsert)[] = [
    { id: manufacturerId, kind: 'manufacturer', ...manufacturerSeed, nameKey: nameKey(manufacturerSeed.name), createdAt: catalogCreated, updatedAt: catalogCreated },
    ...(Object.keys(agencySeeds) as AgencyKey[]).map((k) => ({
      id: agencyId[k],
      kind: 'agency' as const,
      ...agencySeeds[k],
      nameKey: nameKey(agencySeeds[k].name),
      createdAt: catalogCreated,
      updatedAt: catalogCreated,
    })),
  ];
  const termsRows: (typeof agencyTerms.$inferInsert)[] = (Object.keys(termsSeeds) as AgencyKey[]).flatMap((k) =>
    termsSeeds[k].map((t) => ({
      id: newId(),
      agencyId: agencyId[k],
      effectiveFrom: daysAgo(t.fromDaysAgo),
      effectiveTo: t.toDaysFromToday === null ? null : addDays(today, t.toDaysFromToday),
      laborRateCents: t.laborRateCents,
      travelRateCents: t.travelRateCents,
      mileageRateCents: t.mileageRateCents,
      maxRoundTripMiles: t.maxRoundTripMiles,
      maxTravelHours: t.maxTravelHours,
      partsDiscountBps: t.partsDiscountBps,
      partsHandlingBps: t.partsHandlingBps,
      overtimeMultiplier: t.overtimeMultiplier,
      filingWindowDays: t.filingWindowDays,
      createdAt: stamp(t.fromDaysAgo + 10),
    })),
  );

  // --- catalogue -------------------------------------------------------------------------
  const familyId = Object.fromEntries(familySeeds.map((f) => [f.code, newId()])) as Record<FamilyCode, string>;
  const familyRows = familySeeds.map((f) => ({ id: familyId[f.code], code: f.code, name: f.name, fuel: f.fuel, createdAt: catalogCreated }));
  const modelId = new Map(modelSeeds.map((m) => [m.modelNumber, newId()]));
  const modelRows = modelSeeds.map((m) => ({
    id: modelId.get(m.modelNumber)!,
    familyId: familyId[m.family],
    modelNumber: m.modelNumber,
    name: m.name,
    partsMonths: m.partsMonths,
    laborMonths: m.laborMonths,
    capMonthsFromShip: m.capMonthsFromShip,
    installGraceDays: m.installGraceDays,
    createdAt: catalogCreated,
    updatedAt: catalogCreated,
  }));
  const partId = new Map(partSeeds.map((p) => [p.partNumber, newId()]));
  const partByNumber = new Map(partSeeds.map((p) => [p.partNumber, p]));
  const partRows = partSeeds.map((p) => ({
    id: partId.get(p.partNumber)!,
    partNumber: p.partNumber,
    description: p.description,
    familyId: p.family ? familyId[p.family] : null,
    listPriceCents: p.listPriceCents,
    returnRequired: p.returnRequired,
    createdAt: catalogCreated,
    updatedAt: catalogCreated,
  }));
  const componentRows = modelSeeds.flatMap((m) =>
    m.components.map((c) => ({ id: newId(), modelId: modelId.get(m.modelNumber)!, partId: partId.get(c.partNumber)!, label: c.label, partsMonths: c.partsMonths })),
  );
  const codeId = new Map(repairCodeSeeds.map((c) => [c.code, newId()]));
  const codeRows = repairCodeSeeds.map((c) => ({
    id: codeId.get(c.code)!,
    code: c.code,
    familyId: familyId[c.family],
    description: c.description,
    allowedHours: c.allowedHours,
    requiredEvidence: c.requiredEvidence,
    createdAt: catalogCreated,
    updatedAt: catalogCreated,
  }));
  const specId = new Map<string, string>();
  const specRows = modelSeeds.flatMap((m) =>
    m.specs.map((s) => {
      const id = newId();
      specId.set(`${m.modelNumber}/${s.key}`, id);
      return {
        id,
        modelId: modelId.get(m.modelNumber)!,
        key: s.key,
        label: s.label,
        unit: s.unit,
        nominal: s.nominal,
        tolerance: s.tolerance,
        phase: s.phase,
        requiredForCodes: s.requiredForCodes,
      };
    }),
  );

  // --- people ----------------------------------------------------------------------------
  const userId = new Map(userSeeds.map((u) => [u.key, newId()]));
  const orgOf = (org: 'manufacturer' | AgencyKey): string => (org === 'manufacturer' ? manufacturerId : agencyId[org]);
  const userOrg = new Map(userSeeds.map((u) => [u.key, orgOf(u.org)]));
  const userRows = userSeeds.map((u) => ({
    id: userId.get(u.key)!,
    organisationId: orgOf(u.org),
    role: u.role,
    email: u.email,
    name: u.name,
    passwordHash,
    active: u.active ?? true,
    createdAt: stamp(880),
    updatedAt: stamp(880),
  }));
  const certRows = certificationSeeds.map((c, i) => ({
    id: newId(),
    organisationId: userOrg.get(c.user)!,
    userId: userId.get(c.user)!,
    familyId: familyId[c.family],
    certificateNumber: `LCC-${c.family}-${String(4101 + i * 7).padStart(5, '0')}`,
    validFrom: daysAgo(c.fromDaysAgo),
    validTo: addDays(today, c.toDaysFromToday),
    createdAt: stamp(c.fromDaysAgo),
  }));
  const certifiedOn = (user: string, family: FamilyCode, date: string): boolean =>
    certificationSeeds.some(
      (c) => c.user === user && c.family === family && daysAgo(c.fromDaysAgo) <= date && date <= addDays(today, c.toDaysFromToday),
    );

  // --- restaurants and units -------------------------------------------------------------
  const siteRows = siteSeeds.map((s) => ({
    id: newId(),
    name: `${CHAIN_NAME} #${s.storeNumber}`,
    addressLine: s.street,
    city: s.city,
    region: s.region,
    postalCode: s.postalCode,
    latitude: s.latitude,
    longitude: s.longitude,
    createdAt: stamp(880),
  }));

  const serialCounter = new Map(modelSeeds.map((m) => [m.modelNumber, rng.int(11, 60)]));
  const unitPlans: UnitPlan[] = [];
  siteSeeds.forEach((_, siteIndex) => {
    const lineup: string[] = [
      rng.pick(['LC-G2-24', 'LC-G2-24', 'LC-G2-36']),
      rng.pick(['LC-OF-50', 'LC-OF-50', 'LC-OF-35']),
      siteIndex % 2 === 0 ? 'LC-HC-2' : 'LC-CV-18',
    ];
    for (const modelNumber of lineup) {
      const model = modelSeeds.find((m) => m.modelNumber === modelNumber)!;
      // Three in four units are recent enough to be covered; the rest are past their cap.
      const shipAge = rng.chance(0.75) ? rng.int(150, 640) : rng.int(1_050, 1_500);
      const shipDate = daysAgo(shipAge);
      const installDate = rng.chance(0.1) ? null : daysAgo(Math.max(3, shipAge - rng.int(7, 75)));
      const n = serialCounter.get(modelNumber)! + rng.int(1, 37);
      serialCounter.set(modelNumber, n);
      unitPlans.push({
        id: newId(),
        serial: `${modelNumber}-${String(n).padStart(5, '0')}`,
        model,
        modelId: modelId.get(modelNumber)!,
        family: model.family,
        revision: shipAge > 700 ? 'A' : shipAge > 330 ? 'B' : 'C',
        shipDate,
        installDate,
        siteIndex,
      });
    }
  });
  const unitRows = unitPlans.map((u) => ({
    id: u.id,
    serial: u.serial,
    modelId: u.modelId,
    revision: u.revision,
    shipDate: u.shipDate,
    installDate: u.installDate,
    // The manufacturer's registration: a unit whose installation was registered (install date and
    // place) carries its site; the others are known at a site only from the claims filed on them.
    siteId: u.installDate ? siteRows[u.siteIndex].id : null,
    createdAt: iso(dayStart(u.shipDate) + 14 * HOUR),
  }));

  // --- claims ----------------------------------------------------------------------------
  const technicians: Record<AgencyKey, string[]> = {
    harborview: userSeeds.filter((u) => u.org === 'harborview' && u.role === 'technician' && u.active !== false).map((u) => u.key),
    prairie: userSeeds.filter((u) => u.org === 'prairie' && u.role === 'technician' && u.active !== false).map((u) => u.key),
  };
  const demoTech: Record<AgencyKey, string> = { harborview: 'hv-tech', prairie: 'pl-tech' };
  const reviewers = ['lk-reviewer', 'lk-reviewer', 'lk-reviewer2'];
  const accountant = 'lk-accounts';
  const codesOf = (family: FamilyCode) => repairCodeSeeds.filter((c) => c.family === family);
  const hasReturnPart = (c: RepairCodeSeed) => c.parts.some((p) => partByNumber.get(p.partNumber)!.returnRequired);
  const usedUnits = new Set<string>();
  const plans: ClaimPlan[] = [];

  for (const scenario of SCENARIOS) {
    const { state, agency, variant } = scenario;
    const plan: ClaimPlan = {
      id: newId(),
      scenario,
      number: '',
      agency,
      technician: demoTech[agency],
      reviewer: null,
      unit: null,
      complaint: '',
      cause: '',
      correction: '',
      failureDate: null,
      repairDate: null,
      preAuthorization: null,
      labor: [],
      travel: null,
      partLines: [],
      readings: [],
      events: [],
      comments: [],
      claimedTotalCents: 0,
      flags: [],
      terms: null,
    };

    const failureDate = daysAgo(rng.int(scenario.age[0], scenario.age[1]));
    const repairDate = minDate(addDays(failureDate, rng.weighted([[0, 5], [1, 3], [2, 1]] as const)), daysAgo(1));
    plan.failureDate = failureDate;
    plan.repairDate = repairDate;
    const terms = termsFor(agency, repairDate, today);
    plan.terms = terms;

    // Which family, which codes.
    let forcedFamily: FamilyCode | null = null;
    let forcedCode: string | null = null;
    if (variant === 'liquid_damage') forcedCode = 'GR-150';
    if (variant === 'readings_missing') forcedCode = 'GR-110';
    if (variant === 'installation_fault') forcedCode = 'HC-320';
    if (variant === 'uncertified') forcedFamily = 'FRY';
    if (forcedCode) forcedFamily = repairCodeSeeds.find((c) => c.code === forcedCode)!.family;

    // The unit.
    const repeatOf = variant === 'repeat' ? plans.find((p) => p.scenario.variant === 'repeat_source') : undefined;
    if (variant !== 'no_unit') {
      if (repeatOf?.unit) {
        plan.unit = repeatOf.unit;
      } else {
        const wantCovered = variant !== 'out_of_coverage';
        const fits = (u: UnitPlan, farSiteOnly: boolean): boolean => {
          if (siteSeeds[u.siteIndex].agency !== agency) return false;
          if (forcedFamily && u.family !== forcedFamily) return false;
          if (farSiteOnly && siteSeeds[u.siteIndex].storeNumber !== (agency === 'harborview' ? 142 : 244)) return false;
          if (addDays(u.installDate ?? u.shipDate, 7) > failureDate) return false;
          const cov = coverageOn(u, failureDate);
          return wantCovered ? cov.parts && cov.labor : !cov.parts && !cov.labor;
        };
        // The far-away restaurant is preferred for the travel-cap claims, not required.
        let pool = unitPlans.filter((u) => fits(u, variant === 'travel_cap'));
        if (pool.length === 0) pool = unitPlans.filter((u) => fits(u, false));
        const fresh = pool.filter((u) => !usedUnits.has(u.id));
        const chosen = fresh.length > 0 ? rng.pick(fresh) : pool.length > 0 ? rng.pick(pool) : null;
        if (!chosen) throw new Error(`seedDemo: no unit fits the ${state}/${variant} claim of ${agency}`);
        plan.unit = chosen;
      }
      usedUnits.add(plan.unit.id);
    }

    // The technician: one certified for the family on the repair date, the demo one most often.
    if (variant === 'uncertified') {
      plan.technician = 'pl-tech';
    } else if (repeatOf) {
      plan.technician = repeatOf.technician;
    } else {
      const family = plan.unit?.family;
      const eligible = technicians[agency].filter((t) => !family || certifiedOn(t, family, repairDate));
      plan.technician = eligible.length === 0 ? demoTech[agency] : rng.weighted(eligible.map((t) => [t, t === demoTech[agency] ? 3 : 1] as const));
    }

    if (!plan.unit) {
      // A draft started from the kitchen before the unit was identified.
      plan.complaint = 'Fryer on the left will not light. Serial plate is behind grease; will read it on the next visit.';
      plan.repairDate = null;
    } else {
      const unit = plan.unit;
      const family = unit.family;
      let candidates = codesOf(family);
      if (variant === 'none_open_run') candidates = candidates.filter((c) => !hasReturnPart(c));
      if (variant === 'awaiting' || variant === 'shipped' || variant === 'received' || variant === 'received_open_run' || variant === 'adjusted')
        candidates = candidates.filter(hasReturnPart);
      const weight = (c: RepairCodeSeed): number =>
        // Revision A grills wear out their lift actuators; revision B fryers their gas valves.
        (unit.revision === 'A' && c.code === 'GR-140') || (unit.revision === 'B' && c.code === 'FR-220') ? 4 : 1;
      const primary = forcedCode
        ? repairCodeSeeds.find((c) => c.code === forcedCode)!
        : repeatOf
          ? repeatOf.labor[0].code
          : rng.weighted(candidates.map((c) => [c, weight(c)] as const));
      const lineCodes = [primary];
      const others = candidates.filter((c) => c.code !== primary.code && (variant !== 'none_open_run' || !hasReturnPart(c)));
      if (!forcedCode && !repeatOf && others.length > 0 && rng.chance(0.25)) lineCodes.push(rng.pick(others));

      plan.complaint = primary.complaint;
      plan.cause = lineCodes.map((c) => c.cause).join(' ');
      plan.correction = lineCodes.map((c) => c.correction).join(' ');
      if (variant === 'incomplete_information') {
        plan.cause = 'Unit not working.';
        plan.correction = 'Fixed unit.';
      }
      if (variant === 'liquid_damage') plan.cause = 'Control board shorted; the compartment showed signs of liquid.';
      if (variant === 'installation_fault') plan.cause = 'Controller burnt out; the cabinet was found wired to 208 V instead of 120 V.';
      if (state === 'draft' && rng.chance(0.5)) plan.correction = '';

      const overtime = variant === 'overtime';
      if (overtime) plan.preAuthorization = `PA-${rng.int(100_000, 999_999)}`;
      plan.labor = lineCodes.map((code, i) => {
        // Most repairs fit the guide; about one in five runs over it.
        const factor = variant === 'labor_over_guide' ? 2.2 : rng.chance(0.2) ? rng.real(1.1, 1.45) : rng.real(0.75, 1);
        return {
          code,
          hoursWorked: Math.max(0.3, round(code.allowedHours * factor, 1)),
          overtime: overtime && i === 0,
          note: overtime && i === 0 ? 'After-hours call at the store manager\'s request; pre-authorised by phone.' : '',
        };
      });

      // Travel from the agency's base to the restaurant and back.
      const base = agencySeeds[agency];
      const site = siteSeeds[unit.siteIndex];
      const oneWay = greatCircleMiles(base.latitude, base.longitude, site.latitude, site.longitude);
      const miles = round(2 * oneWay * rng.real(1.12, 1.3), 1);
      const hours = Math.max(0.3, round(miles / rng.real(38, 48), 1));
      plan.travel = { miles, hours, claimedCents: 0 };

      // Parts the repairs normally use.
      const qty = new Map<string, number>();
      for (const c of lineCodes) for (const p of c.parts) qty.set(p.partNumber, (qty.get(p.partNumber) ?? 0) + p.quantity);
      plan.partLines = [...qty].map(([pn, quantity]) => ({ part: partByNumber.get(pn)!, quantity, claimedCents: 0, returnStatus: 'not_required' }));

      // Readings the repair codes call for, plus sometimes the supply voltage.
      const codes = new Set(lineCodes.map((c) => c.code));
      const specs = unit.model.specs.filter((s) => s.requiredForCodes.some((c) => codes.has(c)) || (s.key === 'supply_voltage' && rng.chance(0.5)));
      const faultSpec = specs.find((s) => s.faultOffset !== 0 && s.requiredForCodes.includes(primary.code));
      let afterOutDone = false;
      for (const spec of specs) {
        const phases = spec.phase === 'both' ? (['before', 'after'] as const) : ([spec.phase] as const);
        for (const phase of phases) {
          if (phase === 'after' && (variant === 'readings_missing' || (state === 'draft' && variant === 'normal' && rng.chance(0.5)))) continue;
          let v: number;
          if (phase === 'before') {
            v = spec === faultSpec ? spec.nominal + spec.faultOffset * spec.tolerance * rng.real(0.8, 1.2) : spec.nominal + spec.tolerance * rng.real(-0.5, 0.5);
            if (variant === 'installation_fault' && spec.key === 'supply_voltage') v = 208 + rng.real(-2, 2);
          } else if (variant === 'after_out' && !afterOutDone) {
            v = spec.nominal + spec.tolerance * rng.real(1.4, 1.8);
            afterOutDone = true;
          } else {
            v = spec.nominal + spec.tolerance * rng.real(-0.6, 0.6);
          }
          const entered = enteredReading(rng, spec, v);
          plan.readings.push({ spec, phase, ...entered });
        }
      }
    }

    // Claimed amounts, from the terms in force on the repair date.
    const mileage = terms.mileageRateCents ?? estimatedIrsMileageCents(Number((plan.repairDate ?? failureDate).slice(0, 4)));
    const laborClaimed = plan.labor.map((l) => cents(l.hoursWorked * terms.laborRateCents * (l.overtime ? terms.overtimeMultiplier : 1)));
    if (plan.travel) plan.travel.claimedCents = cents(plan.travel.miles * mileage) + cents(plan.travel.hours * terms.travelRateCents);
    for (const pl of plan.partLines) {
      const net = cents(pl.quantity * pl.part.listPriceCents * (1 - terms.partsDiscountBps / 10_000));
      pl.claimedCents = net + cents((net * terms.partsHandlingBps) / 10_000);
    }
    plan.claimedTotalCents = sumOf(laborClaimed) + (plan.travel?.claimedCents ?? 0) + sumOf(plan.partLines.map((p) => p.claimedCents));

    // --- the audit trail ---------------------------------------------------------------
    const tech = plan.technician;
    const reviewer = state === 'draft' || variant === 'from_draft' || state === 'submitted' ? null : rng.pick(reviewers);
    plan.reviewer = reviewer;
    const created = dayStart(plan.repairDate ?? failureDate) + rng.int(15, 22) * HOUR + rng.int(0, 59) * 60_000 + (rng.chance(0.3) ? DAY : 0);
    type Step = { type: string; from: ClaimStateValue; to: ClaimStateValue; actor: string; gap: number; reason?: string; comment?: string };
    const steps: Step[] = [];
    const h = (a: number, b: number) => rng.int(a * 60, b * 60) * 60_000;
    const submitGap = (): number =>
      variant === 'late' || variant === 'filed_late'
        ? dayStart(addDays(plan.repairDate!, terms.filingWindowDays + rng.int(4, 8))) + rng.int(15, 21) * HOUR - created
        : h(1, 30);
    const submit = (first: boolean): Step => ({ type: 'submit', from: first ? 'draft' : 'returned', to: 'submitted', actor: tech, gap: first ? submitGap() : h(20, 90) });
    const startReview = (): Step => ({ type: 'start_review', from: 'submitted', to: 'in_review', actor: reviewer!, gap: h(3, 50) });
    const returnStep = (reason: keyof typeof returnReasonSeeds): Step => ({
      type: 'return', from: 'in_review', to: 'returned', actor: reviewer!, gap: h(1, 6), reason, comment: returnReasonSeeds[reason],
    });
    const reviewedOnce = (): Step[] => [submit(true), startReview()];
    const returnedOnce = (reason: keyof typeof returnReasonSeeds): Step[] => [...reviewedOnce(), returnStep(reason), submit(false), startReview()];
    const approve = (): Step => ({ type: 'approve', from: 'in_review', to: 'approved', actor: reviewer!, gap: h(1, 28) });

    switch (state) {
      case 'draft':
        break;
      case 'submitted':
        steps.push(submit(true));
        break;
      case 'in_review':
        steps.push(...reviewedOnce());
        break;
      case 'returned':
        steps.push(...reviewedOnce(), returnStep(variant as keyof typeof returnReasonSeeds));
        break;
      case 'approved':
      case 'paid':
        steps.push(...(variant === 'returned_once' ? returnedOnce('missing_evidence') : reviewedOnce()), approve());
        break;
      case 'denied': {
        const denial = denialSeeds[variant as keyof typeof denialSeeds];
        steps.push(...reviewedOnce(), { type: 'deny', from: 'in_review', to: 'denied', actor: reviewer!, gap: h(1, 28), reason: denial.reason, comment: denial.comment });
        break;
      }
      case 'withdrawn':
        if (variant === 'from_returned') {
          steps.push(...reviewedOnce(), returnStep('incomplete_information'), {
            type: 'withdraw', from: 'returned', to: 'withdrawn', actor: tech, gap: h(4, 72),
            comment: 'The store found a tripped breaker on the circuit; nothing for warranty after all.',
          });
        } else {
          steps.push({ type: 'withdraw', from: 'draft', to: 'withdrawn', actor: tech, gap: h(1, 20), comment: 'Started twice by mistake; the other draft carries this repair.' });
        }
        break;
    }

    // Squeeze the steps when they would run past the limit, keeping their order.
    const total = sumOf(steps.map((s) => s.gap));
    const scale = steps.length > 0 && created + total > limit ? Math.max(0, limit - created - 60_000) / total : 1;
    let t = created;
    plan.events.push({ type: 'created', from: null, to: 'draft', actor: tech, at: created });
    for (const s of steps) {
      t += Math.max(60_000, Math.floor(s.gap * scale));
      plan.events.push({ type: s.type, from: s.from, to: s.to, actor: s.actor, at: t, reason: s.reason, comment: s.comment });
    }

    // Reviewer adjustments and decided amounts for approved and paid claims.
    if (state === 'approved' || state === 'paid') {
      const approveEvent = plan.events[plan.events.length - 1];
      if (variant === 'adjusted') {
        const line = plan.labor[0];
        line.approvedHours = Math.max(0.1, round(Math.min(line.hoursWorked, line.code.allowedHours) - 0.3, 1));
        line.adjustmentReason = 'Diagnosis time is included in the guide allowance for this repair; reduced by 0.3 h.';
        const reviewStart = plan.events[plan.events.length - 2].at;
        plan.events.splice(plan.events.length - 1, 0, {
          type: 'adjust', from: null, to: null, actor: reviewer!, at: Math.floor((reviewStart + approveEvent.at) / 2),
          reason: 'labor_hours', comment: line.adjustmentReason,
        });
      }
      for (const l of plan.labor) {
        l.approvedHours ??= Math.min(l.hoursWorked, l.code.allowedHours);
        l.approvedCents = cents(l.approvedHours * terms.laborRateCents * (l.overtime ? terms.overtimeMultiplier : 1));
      }
      if (plan.travel) {
        plan.travel.approvedCents =
          cents(Math.min(plan.travel.miles, terms.maxRoundTripMiles) * mileage) + cents(Math.min(plan.travel.hours, terms.maxTravelHours) * terms.travelRateCents);
      }
      const labor = sumOf(plan.labor.map((l) => l.approvedCents!));
      const travel = plan.travel?.approvedCents ?? 0;
      const partsCents = sumOf(plan.partLines.map((p) => p.claimedCents));
      plan.approved = { labor, travel, parts: partsCents, total: labor + travel + partsCents };

      // Part returns: asked for at approval; received before payment.
      const decided = approveEvent.at;
      const returnPlan =
        state === 'paid' || variant === 'received' || variant === 'received_open_run' || variant === 'adjusted'
          ? 'received'
          : variant === 'shipped'
            ? 'shipped'
            : 'awaiting';
      let ready = decided;
      for (const pl of plan.partLines) {
        if (!pl.part.returnRequired) continue;
        pl.returnStatus = returnPlan;
        if (returnPlan === 'shipped' || returnPlan === 'received') {
          pl.shippedAt = Math.min(decided + h(4, 30), decided + Math.floor((limit - decided) * 0.3));
          pl.trackingNumber = `GP${rng.int(100_000_000, 999_999_999)}`;
        }
        if (returnPlan === 'received') {
          pl.receivedAt = Math.min(pl.shippedAt! + h(24, 96), pl.shippedAt! + Math.floor((limit - pl.shippedAt!) * 0.3));
          ready = Math.max(ready, pl.receivedAt);
        }
      }
      plan.readyAt = returnPlan === 'received' || plan.partLines.every((p) => !p.part.returnRequired) ? ready : undefined;
    }

    // A few comments.
    const between = (i: number): number => {
      const a = plan.events[i].at;
      const b = i + 1 < plan.events.length ? plan.events[i + 1].at : limit;
      return a + Math.floor((b - a) * rng.real(0.2, 0.45));
    };
    const reviewIndex = plan.events.findIndex((e) => e.type === 'start_review');
    if (variant === 'with_comment') {
      const asked = between(reviewIndex);
      plan.comments.push({ author: reviewer!, body: 'Were the after-repair readings taken once the unit had been back at set point for a full warm-up?', at: asked });
      plan.comments.push({ author: tech, body: 'Yes, about twenty minutes after the repair, with the crew cooking a test batch.', at: asked + Math.floor((limit - asked) * 0.3) });
    }
    if (state === 'returned') {
      const last = plan.events.length - 1;
      plan.comments.push({ author: tech, body: 'Understood; I will be back on site this week and will update the claim.', at: between(last) });
    }
    if (variant === 'returned_once') {
      const resubmit = plan.events.findIndex((e) => e.type === 'submit' && e.from === 'returned');
      plan.comments.push({ author: tech, body: 'Added a clear photo of the serial plate.', at: plan.events[resubmit].at - 5 * 60_000 });
    }
    if (variant === 'travel_cap') {
      plan.comments.push({ author: tech, body: 'This store is at the edge of our area; travel is as driven.', at: plan.events[0].at + 10 * 60_000 });
    }

    plans.push(plan);
  }

  // --- payment runs ----------------------------------------------------------------------
  interface RunPlan {
    id: string;
    agency: AgencyKey;
    state: 'open' | 'paid';
    createdAt: number;
    paidAt?: number;
    claims: ClaimPlan[];
    number?: string;
  }
  const runs: RunPlan[] = [];
  for (const agency of ['harborview', 'prairie'] as AgencyKey[]) {
    const paid = plans.filter((p) => p.agency === agency && p.scenario.state === 'paid').sort((a, b) => a.readyAt! - b.readyAt!);
    const half = Math.ceil(paid.length / 2);
    for (const group of [paid.slice(0, half), paid.slice(half)]) {
      if (group.length === 0) continue;
      const ready = Math.max(...group.map((p) => p.readyAt!));
      const createdAt = Math.min(ready + h2(rng, 20, 50), ready + Math.floor((limit - ready) * 0.4));
      const paidAt = Math.min(createdAt + h2(rng, 24, 72), createdAt + Math.floor((limit - createdAt) * 0.4));
      runs.push({ id: newId(), agency, state: 'paid', createdAt, paidAt, claims: group });
      for (const p of group) {
        p.paidAt = paidAt;
        p.events.push({ type: 'pay', from: 'approved', to: 'paid', actor: accountant, at: paidAt });
      }
    }
  }
  const openRunClaims = plans.filter((p) => p.scenario.variant === 'received_open_run' || p.scenario.variant === 'none_open_run');
  if (openRunClaims.length > 0) {
    const ready = Math.max(...openRunClaims.map((p) => p.readyAt ?? p.events[p.events.length - 1].at));
    runs.push({
      id: newId(),
      agency: openRunClaims[0].agency,
      state: 'open',
      createdAt: Math.min(ready + 20 * HOUR, ready + Math.floor((limit - ready) * 0.5)),
      claims: openRunClaims,
    });
  }
  runs.sort((a, b) => a.createdAt - b.createdAt);
  const runSeq = new Map<number, number>();
  for (const r of runs) {
    const y = yearOfMs(r.createdAt);
    const n = (runSeq.get(y) ?? 0) + 1;
    runSeq.set(y, n);
    r.number = `PR-${y}-${String(n).padStart(4, '0')}`;
  }

  // --- flags at the last submit ----------------------------------------------------------
  for (const p of plans) {
    const submits = p.events.filter((e) => e.type === 'submit');
    if (submits.length === 0 || !p.unit || !p.repairDate || !p.failureDate) continue;
    const flags: FlagCode[] = [];
    const firstSubmitDate = dateOf(submits[0].at);
    const lastSubmitAt = submits[submits.length - 1].at;
    if (daysBetween(p.repairDate, firstSubmitDate) > p.terms!.filingWindowDays) flags.push('filed_late');
    const cov = coverageOn(p.unit, p.failureDate);
    if (!cov.parts || !cov.labor) flags.push('out_of_coverage');
    const codes = new Set(p.labor.map((l) => l.code.code));
    const repeat = plans.some(
      (o) =>
        o !== p &&
        o.unit?.id === p.unit!.id &&
        o.repairDate !== null &&
        o.scenario.state !== 'withdrawn' &&
        o.events[0].at < lastSubmitAt &&
        o.repairDate < p.repairDate! &&
        daysBetween(o.repairDate, p.repairDate!) <= 90 &&
        o.labor.some((l) => codes.has(l.code.code)),
    );
    if (repeat) flags.push('repeat_repair');
    if (!certifiedOn(p.technician, p.unit.family, p.repairDate)) flags.push('technician_not_certified');
    if (p.labor.some((l) => l.hoursWorked > l.code.allowedHours)) flags.push('labor_over_allowance');
    if (p.travel && (p.travel.miles > p.terms!.maxRoundTripMiles || p.travel.hours > p.terms!.maxTravelHours)) flags.push('travel_over_cap');
    if (p.readings.some((r) => r.phase === 'after' && !inTolerance(r.spec, r.value, r.unit))) flags.push('readings_out_of_tolerance');
    p.flags = flags;
  }

  // --- claim numbers, in order of creation, per year -------------------------------------
  const byCreation = [...plans].sort((a, b) => a.events[0].at - b.events[0].at);
  const claimSeq = new Map<number, number>();
  for (const p of byCreation) {
    const y = yearOfMs(p.events[0].at);
    const n = (claimSeq.get(y) ?? 0) + 1;
    claimSeq.set(y, n);
    p.number = `FP-${y}-${String(n).padStart(6, '0')}`;
  }
  const todayYear = Number(today.slice(0, 4));
  if (!claimSeq.has(todayYear)) claimSeq.set(todayYear, 0);
  const counterRows = [...claimSeq].map(([year, last]) => ({ year, next: last + 1 }));

  // --- rows ------------------------------------------------------------------------------
  const uid = (key: string): string => userId.get(key)!;
  const claimRows: (typeof claims.$inferInsert)[] = [];
  const laborRows: (typeof claimLaborLines.$inferInsert)[] = [];
  const travelRows: (typeof claimTravel.$inferInsert)[] = [];
  const partLineRows: (typeof claimPartLines.$inferInsert)[] = [];
  const readingRows: (typeof claimReadings.$inferInsert)[] = [];
  const eventRows: (typeof claimEvents.$inferInsert)[] = [];
  const commentRows: (typeof comments.$inferInsert)[] = [];
  for (const p of byCreation) {
    const state = p.scenario.state;
    const submits = p.events.filter((e) => e.type === 'submit');
    const decision = p.events.find((e) => e.type === 'approve' || e.type === 'deny');
    const transitions = p.events.filter((e) => e.type !== 'created' && e.to !== null).length;
    const last = p.events.reduce((a, e) => Math.max(a, e.at), 0);
    const createdAt = iso(p.events[0].at);
    claimRows.push({
      id: p.id,
      number: p.number,
      agencyId: agencyId[p.agency],
      technicianId: uid(p.technician),
      unitId: p.unit?.id ?? null,
      siteId: p.unit ? siteRows[p.unit.siteIndex].id : null,
      state,
      version: 1 + transitions,
      complaint: p.complaint,
      cause: p.cause,
      correction: p.correction,
      failureDate: p.failureDate,
      repairDate: p.repairDate,
      preAuthorization: p.preAuthorization,
      claimedTotalCents: p.claimedTotalCents,
      approvedTotalCents: p.approved?.total ?? null,
      approvedLaborCents: p.approved?.labor ?? null,
      approvedTravelCents: p.approved?.travel ?? null,
      approvedPartsCents: p.approved?.parts ?? null,
      flags: p.flags,
      resubmissionCount: Math.max(0, submits.length - 1),
      firstSubmittedAt: submits.length > 0 ? iso(submits[0].at) : null,
      submittedAt: submits.length > 0 ? iso(submits[submits.length - 1].at) : null,
      reviewerId: p.reviewer && p.events.some((e) => e.type === 'start_review') ? uid(p.reviewer) : null,
      decidedAt: decision ? iso(decision.at) : null,
      decidedBy: decision ? uid(decision.actor) : null,
      paidAt: p.paidAt !== undefined ? iso(p.paidAt) : null,
      createdAt,
      updatedAt: iso(last),
    });
    p.labor.forEach((l, i) =>
      laborRows.push({
        id: newId(),
        claimId: p.id,
        position: i + 1,
        repairCodeId: codeId.get(l.code.code)!,
        hoursWorked: l.hoursWorked,
        overtime: l.overtime,
        note: l.note,
        approvedHours: l.approvedHours ?? null,
        adjustmentReason: l.adjustmentReason ?? null,
        approvedAmountCents: l.approvedCents ?? null,
      }),
    );
    if (p.travel) {
      travelRows.push({
        id: newId(),
        claimId: p.id,
        roundTripMiles: p.travel.miles,
        travelHours: p.travel.hours,
        approvedAmountCents: p.travel.approvedCents ?? null,
      });
    }
    p.partLines.forEach((pl, i) =>
      partLineRows.push({
        id: newId(),
        claimId: p.id,
        position: i + 1,
        partId: partId.get(pl.part.partNumber)!,
        quantity: pl.quantity,
        approvedQuantity: p.approved ? pl.quantity : null,
        approvedAmountCents: p.approved ? pl.claimedCents : null,
        returnStatus: pl.returnStatus,
        carrier: pl.shippedAt !== undefined ? 'Ground parcel' : null,
        trackingNumber: pl.trackingNumber ?? null,
        shippedAt: pl.shippedAt !== undefined ? iso(pl.shippedAt) : null,
        receivedAt: pl.receivedAt !== undefined ? iso(pl.receivedAt) : null,
        receivedCondition: pl.receivedAt !== undefined ? 'failure_confirmed' : null,
      }),
    );
    for (const r of p.readings) {
      readingRows.push({
        id: newId(),
        claimId: p.id,
        specId: specId.get(`${p.unit!.model.modelNumber}/${r.spec.key}`) ?? null,
        key: r.spec.key,
        phase: r.phase,
        value: r.value,
        unit: r.unit,
        createdAt,
      });
    }
    for (const e of [...p.events].sort((a, b) => a.at - b.at)) {
      eventRows.push({
        id: newId(),
        claimId: p.id,
        actorId: uid(e.actor),
        organisationId: userOrg.get(e.actor)!,
        type: e.type,
        fromState: e.from,
        toState: e.to,
        reason: e.reason ?? null,
        comment: e.comment ?? null,
        at: iso(e.at),
      });
    }
    for (const c of p.comments) commentRows.push({ id: newId(), claimId: p.id, authorId: uid(c.author), body: c.body, createdAt: iso(c.at) });
  }

  const runRows: (typeof paymentRuns.$inferInsert)[] = [];
  const runItemRows: (typeof paymentRunItems.$inferInsert)[] = [];
  for (const r of runs) {
    runRows.push({
      id: r.id,
      number: r.number!,
      agencyId: agencyId[r.agency],
      payeeName: agencySeeds[r.agency].name,
      state: r.state,
      totalCents: sumOf(r.claims.map((c) => c.approved!.total)),
      createdBy: uid(accountant),
      paymentDate: r.paidAt !== undefined ? dateOf(r.paidAt) : null,
      reference: r.paidAt !== undefined ? `REM-${r.agency === 'harborview' ? 'HV' : 'PL'}-${rng.int(100_000, 999_999)}` : null,
      paidBy: r.paidAt !== undefined ? uid(accountant) : null,
      paidAt: r.paidAt !== undefined ? iso(r.paidAt) : null,
      createdAt: iso(r.createdAt),
    });
    for (const c of r.claims) runItemRows.push({ id: newId(), runId: r.id, claimId: c.id, amountCents: c.approved!.total, active: 1 });
  }

  // --- one transaction -------------------------------------------------------------------
  tx(db, (t) => {
    const put = <T>(rows: T[], insert: (chunk: T[]) => void): void => {
      for (let i = 0; i < rows.length; i += 200) insert(rows.slice(i, i + 200));
    };
    t.insert(organisations).values(orgRows).run();
    t.insert(agencyTerms).values(termsRows).run();
    t.insert(productFamilies).values(familyRows).run();
    t.insert(models).values(modelRows).run();
    t.insert(parts).values(partRows).run();
    t.insert(componentTerms).values(componentRows).run();
    t.insert(repairCodes).values(codeRows).run();
    t.insert(readingSpecs).values(specRows).run();
    t.insert(users).values(userRows).run();
    // Demo accounts whose role needs a second factor get an authenticator secret, random for each
    // database (never a constant): `npm run demo:code -- <e-mail>` prints the current code.
    const totpRows = userSeeds
      .filter((u) => u.demo && u.active !== false && rolesRequiringSecondFactor.includes(u.role))
      .map((u) => ({ userId: userId.get(u.key)!, secret: newTotpSecret(), confirmedAt: stamp(880), createdAt: stamp(880) }));
    if (totpRows.length > 0) t.insert(totpCredentials).values(totpRows).run();
    t.insert(certifications).values(certRows).run();
    t.insert(sites).values(siteRows).run();
    put(unitRows, (c) => t.insert(units).values(c).run());
    put(claimRows, (c) => t.insert(claims).values(c).run());
    put(laborRows, (c) => t.insert(claimLaborLines).values(c).run());
    put(travelRows, (c) => t.insert(claimTravel).values(c).run());
    put(partLineRows, (c) => t.insert(claimPartLines).values(c).run());
    put(readingRows, (c) => t.insert(claimReadings).values(c).run());
    put(eventRows, (c) => t.insert(claimEvents).values(c).run());
    if (commentRows.length > 0) t.insert(comments).values(commentRows).run();
    t.insert(claimCounters).values(counterRows).run();
    t.insert(paymentRuns).values(runRows).run();
    put(runItemRows, (c) => t.insert(paymentRunItems).values(c).run());
    settleSeededAmounts(t, today);
  });

  const claimsByState = Object.fromEntries(
    (['draft', 'submitted', 'in_review', 'returned', 'approved', 'denied', 'paid', 'withdrawn'] as ClaimStateValue[]).map((s) => [
      s,
      plans.filter((p) => p.scenario.state === s).length,
    ]),
  ) as Record<ClaimStateValue, number>;
  return {
    organisations: orgRows.length,
    agencyTerms: termsRows.length,
    users: userRows.length,
    certifications: certRows.length,
    productFamilies: familyRows.length,
    models: modelRows.length,
    readingSpecs: specRows.length,
    componentTerms: componentRows.length,
    parts: partRows.length,
    repairCodes: codeRows.length,
    sites: siteRows.length,
    units: unitRows.length,
    claims: claimRows.length,
    claimsByState,
    claimEvents: eventRows.length,
    comments: commentRows.length,
    paymentRuns: runRows.length,
  };
}

function h2(rng: Random, a: number, b: number): number {
  return rng.int(a * 60, b * 60) * 60_000;
}

// ---------------------------------------------------------------------------------------
// Demo sign-ins

export interface DemoSignIn {
  email: string;
  role: Role;
  roleLabel: string;
  organisation: string;
}

export function demoSignIns(): DemoSignIn[] {
  return userSeeds
    .filter((u) => u.demo)
    .map((u) => ({
      email: u.email,
      role: u.role,
      roleLabel: roleLabels[u.role],
      organisation: u.org === 'manufacturer' ? manufacturerSeed.name : agencySeeds[u.org].name,
    }));
}

/** Prints the demo accounts as a table; called after seeding and at server start-up. */
export function printDemoSignIns(write: (line: string) => void = (line) => console.log(line)): void {
  const rows = demoSignIns();
  const w1 = Math.max(6, ...rows.map((r) => r.email.length));
  const w2 = Math.max(4, ...rows.map((r) => r.roleLabel.length));
  write(`Demo sign-ins (password for every one: ${DEMO_PASSWORD}; invented demo data only)`);
  write(`  ${'E-mail'.padEnd(w1)}  ${'Role'.padEnd(w2)}  Organisation`);
  for (const r of rows) write(`  ${r.email.padEnd(w1)}  ${r.roleLabel.padEnd(w2)}  ${r.organisation}${rolesRequiringSecondFactor.includes(r.role) ? '  (+ authenticator code)' : ''}`);
  const withCode = rows.filter((r) => rolesRequiringSecondFactor.includes(r.role));
  if (withCode.length > 0) {
    write('Accounts marked (+ authenticator code) also ask for a 6-digit code after the password. Print the current one with');
    write(`  npm run demo:code -- ${withCode[0].email}`);
    write('or add the secret it prints to an authenticator app.');
  }
}
