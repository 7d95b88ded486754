/**
 * The fixed part of the demo scenario: organisations, people, catalogue, restaurants.
 * Everything here is invented. City names and their approximate coordinates are the only
 * real-world facts, used so travel distances look plausible.
 */
import type { ReasonCode } from '@shared/workflow/reason-codes';
import type { Role } from '../schema/users';

export type FamilyCode = 'GRL' | 'FRY' | 'HLD' | 'OVN';
export type AgencyKey = 'harborview' | 'prairie';

export interface OrgSeed {
  name: string;
  contactEmail: string;
  addressLine: string;
  city: string;
  region: string;
  postalCode: string;
  latitude: number;
  longitude: number;
  timeZone: string;
}

export const manufacturerSeed: OrgSeed = {
  name: 'Larkfield Cookline Co.',
  contactEmail: 'warranty@larkfield.test',
  addressLine: '400 Foundry Lane',
  city: 'Dayton',
  region: 'OH',
  postalCode: '45402',
  latitude: 39.7589,
  longitude: -84.1916,
  timeZone: 'America/New_York',
};

export const agencySeeds: Record<AgencyKey, OrgSeed> = {
  harborview: {
    name: 'Harborview Appliance Service',
    contactEmail: 'office@harborview.test',
    addressLine: '2750 Harbor Works Road',
    city: 'San Diego',
    region: 'CA',
    postalCode: '92110',
    latitude: 32.7157,
    longitude: -117.1611,
    timeZone: 'America/Los_Angeles',
  },
  prairie: {
    name: 'Prairie Line Kitchen Repair',
    contactEmail: 'dispatch@prairieline.test',
    addressLine: '1185 Grain Elevator Drive',
    city: 'Wichita',
    region: 'KS',
    postalCode: '67202',
    latitude: 37.6872,
    longitude: -97.3301,
    timeZone: 'America/Chicago',
  },
};

/**
 * Contract terms, two periods per agency: an expired one and the one in force. Offsets are
 * days relative to the seed's "today" so the demo stays fresh. mileageRateCents null means
 * "the IRS business standard mileage rate of the repair date's year".
 */
export interface TermsSeed {
  fromDaysAgo: number;
  /** null: open-ended. Otherwise days relative to today (negative: in the past). */
  toDaysFromToday: number | null;
  laborRateCents: number;
  travelRateCents: number;
  mileageRateCents: number | null;
  maxRoundTripMiles: number;
  maxTravelHours: number;
  partsDiscountBps: number;
  partsHandlingBps: number;
  overtimeMultiplier: number;
  filingWindowDays: number;
}

/** The current period starts this many days before today; the expired one ends the day before. */
export const CURRENT_TERMS_FROM_DAYS_AGO = 100;

export const termsSeeds: Record<AgencyKey, [TermsSeed, TermsSeed]> = {
  harborview: [
    {
      fromDaysAgo: 830,
      toDaysFromToday: -(CURRENT_TERMS_FROM_DAYS_AGO + 1),
      laborRateCents: 9_200,
      travelRateCents: 6_000,
      mileageRateCents: null,
      maxRoundTripMiles: 100,
      maxTravelHours: 2,
      partsDiscountBps: 2_000,
      partsHandlingBps: 800,
      overtimeMultiplier: 1.5,
      filingWindowDays: 30,
    },
    {
      fromDaysAgo: CURRENT_TERMS_FROM_DAYS_AGO,
      toDaysFromToday: null,
      laborRateCents: 9_800,
      travelRateCents: 6_500,
      mileageRateCents: null,
      maxRoundTripMiles: 120,
      maxTravelHours: 2.5,
      partsDiscountBps: 1_500,
      partsHandlingBps: 1_000,
      overtimeMultiplier: 1.5,
      filingWindowDays: 30,
    },
  ],
  prairie: [
    {
      fromDaysAgo: 830,
      toDaysFromToday: -(CURRENT_TERMS_FROM_DAYS_AGO + 1),
      laborRateCents: 8_400,
      travelRateCents: 5_500,
      mileageRateCents: 62,
      maxRoundTripMiles: 150,
      maxTravelHours: 3,
      partsDiscountBps: 2_500,
      partsHandlingBps: 1_000,
      overtimeMultiplier: 1.5,
      filingWindowDays: 45,
    },
    {
      fromDaysAgo: CURRENT_TERMS_FROM_DAYS_AGO,
      toDaysFromToday: null,
      laborRateCents: 8_900,
      travelRateCents: 5_800,
      mileageRateCents: 65.5,
      maxRoundTripMiles: 150,
      maxTravelHours: 3,
      partsDiscountBps: 2_500,
      partsHandlingBps: 1_200,
      overtimeMultiplier: 1.5,
      filingWindowDays: 45,
    },
  ],
};

export interface UserSeed {
  key: string;
  org: 'manufacturer' | AgencyKey;
  role: Role;
  email: string;
  name: string;
  active?: boolean;
  /** Shown in the sign-in table printed after seeding. */
  demo?: boolean;
}

export const userSeeds: UserSeed[] = [
  { key: 'hv-tech', org: 'harborview', role: 'technician', email: 'tech@harborview.test', name: 'Mateo Quillan', demo: true },
  { key: 'hv-admin', org: 'harborview', role: 'agency_admin', email: 'admin@harborview.test', name: 'Renata Osgood', demo: true },
  { key: 'pl-tech', org: 'prairie', role: 'technician', email: 'tech@prairieline.test', name: 'Wes Tamberlin', demo: true },
  { key: 'pl-admin', org: 'prairie', role: 'agency_admin', email: 'admin@prairieline.test', name: 'Joan Pellerin', demo: true },
  { key: 'lk-reviewer', org: 'manufacturer', role: 'reviewer', email: 'reviewer@larkfield.test', name: 'Dana Whitcombe', demo: true },
  { key: 'lk-accounts', org: 'manufacturer', role: 'accountant', email: 'accounts@larkfield.test', name: 'Glen Ashworth', demo: true },
  { key: 'lk-admin', org: 'manufacturer', role: 'manufacturer_admin', email: 'admin@larkfield.test', name: 'Hollis Varga', demo: true },
  // Extra people so lists, filters and certifications have something to show.
  { key: 'hv-tech2', org: 'harborview', role: 'technician', email: 'priya.halvorsen@harborview.test', name: 'Priya Halvorsen' },
  { key: 'hv-tech3', org: 'harborview', role: 'technician', email: 'tomas.ferlund@harborview.test', name: 'Tomas Ferlund' },
  { key: 'pl-tech2', org: 'prairie', role: 'technician', email: 'cal.brightwater@prairieline.test', name: 'Cal Brightwater' },
  { key: 'pl-tech3', org: 'prairie', role: 'technician', email: 'ned.farrow@prairieline.test', name: 'Ned Farrow', active: false },
  { key: 'lk-reviewer2', org: 'manufacturer', role: 'reviewer', email: 'marisol.oyelaran@larkfield.test', name: 'Marisol Oyelaran' },
];

export interface CertificationSeed {
  user: string;
  family: FamilyCode;
  fromDaysAgo: number;
  /** Days relative to today; negative means already expired. */
  toDaysFromToday: number;
}

const certAll = (user: string, except: FamilyCode[] = []): CertificationSeed[] =>
  (['GRL', 'FRY', 'HLD', 'OVN'] as FamilyCode[])
    .filter((f) => !except.includes(f))
    .map((family) => ({ user, family, fromDaysAgo: 700, toDaysFromToday: 400 }));

export const certificationSeeds: CertificationSeed[] = [
  // The grill certificate of the Harborview demo technician runs out within 30 days.
  ...certAll('hv-tech', ['GRL']),
  { user: 'hv-tech', family: 'GRL', fromDaysAgo: 712, toDaysFromToday: 18 },
  ...certAll('hv-tech2'),
  ...certAll('hv-tech3', ['OVN']),
  // The fryer certificate of the Prairie Line demo technician ran out 40 days ago.
  ...certAll('pl-tech', ['FRY']),
  { user: 'pl-tech', family: 'FRY', fromDaysAgo: 770, toDaysFromToday: -40 },
  ...certAll('pl-tech2', ['HLD']),
  { user: 'pl-tech3', family: 'GRL', fromDaysAgo: 900, toDaysFromToday: -200 },
];

export interface FamilySeed {
  code: FamilyCode;
  name: string;
  fuel: 'gas' | 'electric';
}

export const familySeeds: FamilySeed[] = [
  { code: 'GRL', name: 'Two-sided grills', fuel: 'electric' },
  { code: 'FRY', name: 'Open fryers', fuel: 'gas' },
  { code: 'HLD', name: 'Holding cabinets', fuel: 'electric' },
  { code: 'OVN', name: 'Conveyor ovens', fuel: 'gas' },
];

export interface ReadingSpecSeed {
  key: string;
  label: string;
  unit: 'F' | 'C' | 'in' | 'mm' | 'A' | 'V';
  nominal: number;
  tolerance: number;
  phase: 'before' | 'after' | 'both';
  requiredForCodes: string[];
  /** What a faulty unit typically reads before repair, as an offset from nominal in tolerances. */
  faultOffset: number;
}

export interface ModelSeed {
  modelNumber: string;
  family: FamilyCode;
  name: string;
  partsMonths: number;
  laborMonths: number;
  capMonthsFromShip: number;
  installGraceDays: number;
  specs: ReadingSpecSeed[];
  /** Longer parts-only terms on single components. */
  components: { partNumber: string; label: string; partsMonths: number }[];
}

// Cooking height on a stand: 36 in matches the common counter height (common practice).
const grillSpecs = (voltage: number): ReadingSpecSeed[] => [
  { key: 'platen_gap', label: 'Platen gap', unit: 'in', nominal: 0.25, tolerance: 0.01, phase: 'both', requiredForCodes: ['GR-110', 'GR-120', 'GR-140'], faultOffset: 3 },
  { key: 'upper_platen_temp', label: 'Upper platen temperature', unit: 'F', nominal: 425, tolerance: 10, phase: 'both', requiredForCodes: ['GR-120', 'GR-130', 'GR-150'], faultOffset: -6 },
  { key: 'lower_grill_temp', label: 'Lower grill surface temperature', unit: 'F', nominal: 350, tolerance: 10, phase: 'both', requiredForCodes: ['GR-130', 'GR-150'], faultOffset: -3 },
  { key: 'lift_motor_current', label: 'Platen lift motor current', unit: 'A', nominal: 1.2, tolerance: 0.3, phase: 'both', requiredForCodes: ['GR-140'], faultOffset: 3 },
  { key: 'supply_voltage', label: 'Supply voltage at the terminal block', unit: 'V', nominal: voltage, tolerance: 10, phase: 'before', requiredForCodes: ['GR-120', 'GR-150'], faultOffset: 0 },
  { key: 'cooking_height', label: 'Cooking surface height', unit: 'in', nominal: 36, tolerance: 0.5, phase: 'both', requiredForCodes: ['GR-160'], faultOffset: -2 },
];

const fryerSpecs: ReadingSpecSeed[] = [
  { key: 'oil_temp', label: 'Oil temperature at set point', unit: 'F', nominal: 350, tolerance: 5, phase: 'both', requiredForCodes: ['FR-210', 'FR-220', 'FR-230', 'FR-250', 'FR-260'], faultOffset: -8 },
  { key: 'filter_pump_current', label: 'Filter pump motor current', unit: 'A', nominal: 4, tolerance: 0.8, phase: 'both', requiredForCodes: ['FR-240'], faultOffset: 2.5 },
  { key: 'supply_voltage', label: 'Control supply voltage', unit: 'V', nominal: 120, tolerance: 6, phase: 'before', requiredForCodes: ['FR-250'], faultOffset: 0 },
];

const holdingSpecs: ReadingSpecSeed[] = [
  { key: 'cabinet_temp', label: 'Cabinet temperature at set point', unit: 'F', nominal: 170, tolerance: 5, phase: 'both', requiredForCodes: ['HC-310', 'HC-320', 'HC-330', 'HC-340'], faultOffset: -6 },
  { key: 'heater_current', label: 'Heater circuit current', unit: 'A', nominal: 6.5, tolerance: 0.7, phase: 'both', requiredForCodes: ['HC-310'], faultOffset: -5 },
  { key: 'fan_motor_current', label: 'Circulation fan current', unit: 'A', nominal: 0.8, tolerance: 0.2, phase: 'both', requiredForCodes: ['HC-330'], faultOffset: 3 },
  { key: 'supply_voltage', label: 'Supply voltage', unit: 'V', nominal: 120, tolerance: 6, phase: 'before', requiredForCodes: ['HC-320'], faultOffset: 0 },
];

const ovenSpecs: ReadingSpecSeed[] = [
  { key: 'bake_temp', label: 'Bake chamber temperature at set point', unit: 'F', nominal: 475, tolerance: 10, phase: 'both', requiredForCodes: ['CV-420', 'CV-430'], faultOffset: -5 },
  { key: 'belt_motor_current', label: 'Conveyor motor current', unit: 'A', nominal: 0.6, tolerance: 0.15, phase: 'both', requiredForCodes: ['CV-410'], faultOffset: 3 },
  { key: 'supply_voltage', label: 'Control supply voltage', unit: 'V', nominal: 120, tolerance: 6, phase: 'before', requiredForCodes: ['CV-420'], faultOffset: 0 },
];

export const modelSeeds: ModelSeed[] = [
  {
    modelNumber: 'LC-G2-24',
    family: 'GRL',
    name: 'Two-sided grill, 24 in, two upper platens',
    partsMonths: 36,
    laborMonths: 24,
    capMonthsFromShip: 42,
    installGraceDays: 90,
    specs: grillSpecs(208),
    components: [{ partNumber: 'P-GR-1001', label: 'Upper platen heater', partsMonths: 60 }],
  },
  {
    modelNumber: 'LC-G2-36',
    family: 'GRL',
    name: 'Two-sided grill, 36 in, three upper platens',
    partsMonths: 36,
    laborMonths: 24,
    capMonthsFromShip: 42,
    installGraceDays: 90,
    specs: grillSpecs(240),
    components: [{ partNumber: 'P-GR-1001', label: 'Upper platen heater', partsMonths: 60 }],
  },
  {
    modelNumber: 'LC-OF-50',
    family: 'FRY',
    name: 'Open fryer, gas, 50 lb oil capacity',
    partsMonths: 24,
    laborMonths: 24,
    capMonthsFromShip: 30,
    installGraceDays: 90,
    specs: fryerSpecs,
    components: [{ partNumber: 'P-FR-2003', label: 'Fry pot', partsMonths: 84 }],
  },
  {
    modelNumber: 'LC-OF-35',
    family: 'FRY',
    name: 'Open fryer, gas, 35 lb oil capacity',
    partsMonths: 24,
    laborMonths: 12,
    capMonthsFromShip: 30,
    installGraceDays: 90,
    specs: fryerSpecs,
    components: [{ partNumber: 'P-FR-2003', label: 'Fry pot', partsMonths: 84 }],
  },
  {
    modelNumber: 'LC-HC-2',
    family: 'HLD',
    name: 'Holding cabinet, two bays, heated',
    partsMonths: 24,
    laborMonths: 24,
    capMonthsFromShip: 30,
    installGraceDays: 60,
    specs: holdingSpecs,
    components: [],
  },
  {
    modelNumber: 'LC-CV-18',
    family: 'OVN',
    name: 'Conveyor oven, gas, 18 in belt',
    partsMonths: 24,
    laborMonths: 18,
    capMonthsFromShip: 30,
    installGraceDays: 90,
    specs: ovenSpecs,
    components: [],
  },
];

export interface PartSeed {
  partNumber: string;
  description: string;
  family: FamilyCode | null;
  listPriceCents: number;
  returnRequired: boolean;
}

export const partSeeds: PartSeed[] = [
  { partNumber: 'P-GR-1001', description: 'Upper platen heater assembly', family: 'GRL', listPriceCents: 48_500, returnRequired: true },
  { partNumber: 'P-GR-1002', description: 'Platen thermocouple, type K', family: 'GRL', listPriceCents: 6_850, returnRequired: false },
  { partNumber: 'P-GR-1003', description: 'Platen lift actuator', family: 'GRL', listPriceCents: 39_900, returnRequired: true },
  { partNumber: 'P-GR-1004', description: 'Grill control board', family: 'GRL', listPriceCents: 61_200, returnRequired: true },
  { partNumber: 'P-GR-1005', description: 'Platen gap shim set', family: 'GRL', listPriceCents: 1_875, returnRequired: false },
  { partNumber: 'P-GR-1006', description: 'Adjustable leveling leg', family: 'GRL', listPriceCents: 2_450, returnRequired: false },
  { partNumber: 'P-FR-2001', description: 'Oil temperature probe', family: 'FRY', listPriceCents: 9_400, returnRequired: false },
  { partNumber: 'P-FR-2002', description: 'Gas valve, 24 V combination', family: 'FRY', listPriceCents: 28_750, returnRequired: true },
  { partNumber: 'P-FR-2003', description: 'Fry pot, welded, with insulation', family: 'FRY', listPriceCents: 142_000, returnRequired: true },
  { partNumber: 'P-FR-2004', description: 'Filter pump motor', family: 'FRY', listPriceCents: 33_500, returnRequired: true },
  { partNumber: 'P-FR-2005', description: 'Ignition module', family: 'FRY', listPriceCents: 18_900, returnRequired: false },
  { partNumber: 'P-FR-2006', description: 'High-limit thermostat', family: 'FRY', listPriceCents: 7_200, returnRequired: false },
  { partNumber: 'P-HC-3001', description: 'Heater element, 500 W', family: 'HLD', listPriceCents: 8_600, returnRequired: false },
  { partNumber: 'P-HC-3002', description: 'Cabinet controller', family: 'HLD', listPriceCents: 29_800, returnRequired: true },
  { partNumber: 'P-HC-3003', description: 'Circulation fan motor', family: 'HLD', listPriceCents: 11_200, returnRequired: false },
  { partNumber: 'P-HC-3004', description: 'Door gasket', family: 'HLD', listPriceCents: 3_150, returnRequired: false },
  { partNumber: 'P-CV-4001', description: 'Conveyor drive motor', family: 'OVN', listPriceCents: 26_400, returnRequired: true },
  { partNumber: 'P-CV-4002', description: 'Burner ignition control', family: 'OVN', listPriceCents: 21_700, returnRequired: false },
  { partNumber: 'P-CV-4003', description: 'Oven temperature controller', family: 'OVN', listPriceCents: 24_900, returnRequired: true },
  { partNumber: 'P-GN-9001', description: 'Control fuse kit', family: null, listPriceCents: 1_250, returnRequired: false },
];

export interface RepairCodeSeed {
  code: string;
  family: FamilyCode;
  description: string;
  allowedHours: number;
  requiredEvidence: string[];
  /** Parts normally replaced by this repair, with their usual quantity. */
  parts: { partNumber: string; quantity: number }[];
  complaint: string;
  cause: string;
  correction: string;
}

export const repairCodeSeeds: RepairCodeSeed[] = [
  {
    code: 'GR-110', family: 'GRL', description: 'Platen gap calibration, all platens', allowedHours: 1.0,
    requiredEvidence: ['serial_plate', 'readings_sheet'],
    parts: [{ partNumber: 'P-GR-1005', quantity: 1 }],
    complaint: 'Patties come out thicker at the front than at the back; crew reports uneven cook.',
    cause: 'Platen gap out of adjustment at the front corners.',
    correction: 'Re-shimmed and recalibrated the platen gap on every platen, verified with a test cook.',
  },
  {
    code: 'GR-120', family: 'GRL', description: 'Upper platen heater replacement', allowedHours: 2.0,
    requiredEvidence: ['serial_plate', 'failed_part', 'replacement_part'],
    parts: [{ partNumber: 'P-GR-1001', quantity: 1 }],
    complaint: 'Upper platen will not reach temperature; product undercooked on top.',
    cause: 'Open circuit in the upper platen heater.',
    correction: 'Replaced the upper platen heater assembly, recalibrated the gap and ran a cook cycle.',
  },
  {
    code: 'GR-130', family: 'GRL', description: 'Platen thermocouple replacement', allowedHours: 1.2,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-GR-1002', quantity: 1 }],
    complaint: 'Temperature error shown on the display during the lunch rush.',
    cause: 'Thermocouple lead chafed through at the platen hinge.',
    correction: 'Replaced the thermocouple, re-routed the lead and verified platen temperature.',
  },
  {
    code: 'GR-140', family: 'GRL', description: 'Platen lift actuator replacement', allowedHours: 1.8,
    requiredEvidence: ['serial_plate', 'failed_part', 'unit_overall'],
    parts: [{ partNumber: 'P-GR-1003', quantity: 1 }],
    complaint: 'Upper platen stalls halfway when lowering.',
    cause: 'Lift actuator gearbox worn; motor draws high current and stalls.',
    correction: 'Replaced the lift actuator, checked travel limits and the platen gap.',
  },
  {
    code: 'GR-150', family: 'GRL', description: 'Grill control board replacement', allowedHours: 1.5,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-GR-1004', quantity: 1 }, { partNumber: 'P-GN-9001', quantity: 1 }],
    complaint: 'Grill dead at start-up; display stays blank.',
    cause: 'Control board failed; relay contacts burnt.',
    correction: 'Replaced the control board and fuses, loaded the menu settings and tested every lane.',
  },
  {
    code: 'GR-160', family: 'GRL', description: 'Stand leveling and cooking height adjustment', allowedHours: 0.5,
    requiredEvidence: ['unit_overall'],
    parts: [{ partNumber: 'P-GR-1006', quantity: 2 }],
    complaint: 'Grill rocks on its stand and grease runs to one side.',
    cause: 'Two leveling legs stripped.',
    correction: 'Replaced two leveling legs, leveled the grill and set the cooking height.',
  },
  {
    code: 'FR-210', family: 'FRY', description: 'Oil temperature probe replacement', allowedHours: 1.0,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-FR-2001', quantity: 1 }],
    complaint: 'Fryer overshoots set point; fries come out dark.',
    cause: 'Oil temperature probe reading low and drifting.',
    correction: 'Replaced the probe, boiled out the pot and verified oil temperature at set point.',
  },
  {
    code: 'FR-220', family: 'FRY', description: 'Gas valve replacement', allowedHours: 1.8,
    requiredEvidence: ['serial_plate', 'failed_part', 'replacement_part'],
    parts: [{ partNumber: 'P-FR-2002', quantity: 1 }],
    complaint: 'Fryer will not heat; burner does not light.',
    cause: 'Gas valve coil open; valve does not open on a call for heat.',
    correction: 'Replaced the gas valve, leak-checked every joint and verified recovery to set point.',
  },
  {
    code: 'FR-230', family: 'FRY', description: 'Fry pot replacement', allowedHours: 5.0,
    requiredEvidence: ['serial_plate', 'failed_part', 'unit_overall', 'invoice'],
    parts: [{ partNumber: 'P-FR-2003', quantity: 1 }, { partNumber: 'P-FR-2006', quantity: 1 }],
    complaint: 'Oil leaking under the fryer.',
    cause: 'Crack in the fry pot weld at the rear corner.',
    correction: 'Replaced the fry pot and high-limit thermostat, leak-checked gas, filled and tested.',
  },
  {
    code: 'FR-240', family: 'FRY', description: 'Filter pump motor replacement', allowedHours: 1.5,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-FR-2004', quantity: 1 }],
    complaint: 'Filter pump hums but does not return oil.',
    cause: 'Filter pump motor seized.',
    correction: 'Replaced the filter pump motor and ran two filter cycles.',
  },
  {
    code: 'FR-250', family: 'FRY', description: 'Ignition module replacement', allowedHours: 1.0,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-FR-2005', quantity: 1 }],
    complaint: 'Burner lights, then drops out after a few seconds.',
    cause: 'Ignition module not sensing flame.',
    correction: 'Replaced the ignition module, checked flame sense and leak-checked the gas train.',
  },
  {
    code: 'FR-260', family: 'FRY', description: 'High-limit thermostat replacement', allowedHours: 0.8,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-FR-2006', quantity: 1 }],
    complaint: 'Fryer shuts off mid-cook and needs a manual reset.',
    cause: 'High-limit thermostat tripping below its rating.',
    correction: 'Replaced the high-limit thermostat and verified normal operation at set point.',
  },
  {
    code: 'HC-310', family: 'HLD', description: 'Heater element replacement', allowedHours: 1.2,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-HC-3001', quantity: 2 }],
    complaint: 'Lower bay will not hold temperature.',
    cause: 'Two heater elements open.',
    correction: 'Replaced both heater elements in the lower bay and verified cabinet temperature.',
  },
  {
    code: 'HC-320', family: 'HLD', description: 'Cabinet controller replacement', allowedHours: 1.0,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-HC-3002', quantity: 1 }],
    complaint: 'Timers reset on their own; display flickers.',
    cause: 'Cabinet controller failing.',
    correction: 'Replaced the controller, restored the product timers and verified set points.',
  },
  {
    code: 'HC-330', family: 'HLD', description: 'Circulation fan motor replacement', allowedHours: 0.8,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-HC-3003', quantity: 1 }],
    complaint: 'Loud grinding noise from the cabinet; food dries out.',
    cause: 'Circulation fan motor bearings worn.',
    correction: 'Replaced the fan motor and checked airflow and cabinet temperature.',
  },
  {
    code: 'HC-340', family: 'HLD', description: 'Door gasket replacement', allowedHours: 0.6,
    requiredEvidence: ['unit_overall'],
    parts: [{ partNumber: 'P-HC-3004', quantity: 2 }],
    complaint: 'Heat escaping around the doors.',
    cause: 'Door gaskets torn.',
    correction: 'Replaced both door gaskets and checked the door seal.',
  },
  {
    code: 'CV-410', family: 'OVN', description: 'Conveyor drive motor replacement', allowedHours: 1.5,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-CV-4001', quantity: 1 }],
    complaint: 'Conveyor belt stops intermittently.',
    cause: 'Drive motor overheating and stalling.',
    correction: 'Replaced the drive motor, adjusted belt tension and timed the belt.',
  },
  {
    code: 'CV-420', family: 'OVN', description: 'Burner ignition control replacement', allowedHours: 1.6,
    requiredEvidence: ['serial_plate', 'failed_part'],
    parts: [{ partNumber: 'P-CV-4002', quantity: 1 }],
    complaint: 'Oven goes to lockout at start-up.',
    cause: 'Burner ignition control failed.',
    correction: 'Replaced the ignition control, leak-checked gas and verified bake temperature.',
  },
  {
    code: 'CV-430', family: 'OVN', description: 'Temperature controller calibration', allowedHours: 0.8,
    requiredEvidence: ['serial_plate', 'readings_sheet'],
    parts: [],
    complaint: 'Product under-baked at the usual belt time.',
    cause: 'Temperature controller offset drifted.',
    correction: 'Calibrated the temperature controller against a reference probe.',
  },
];

export interface SiteSeed {
  agency: AgencyKey;
  storeNumber: number;
  street: string;
  city: string;
  region: string;
  postalCode: string;
  latitude: number;
  longitude: number;
}

/** Restaurants of an invented chain, "Kettlewick Burgers", near each agency's base. */
export const CHAIN_NAME = 'Kettlewick Burgers';

export const siteSeeds: SiteSeed[] = [
  { agency: 'harborview', storeNumber: 104, street: '880 Commerce Way', city: 'Chula Vista', region: 'CA', postalCode: '91910', latitude: 32.6401, longitude: -117.0842 },
  { agency: 'harborview', storeNumber: 107, street: '1415 Market Street', city: 'National City', region: 'CA', postalCode: '91950', latitude: 32.6781, longitude: -117.0992 },
  { agency: 'harborview', storeNumber: 111, street: '7720 Center Avenue', city: 'La Mesa', region: 'CA', postalCode: '91942', latitude: 32.7678, longitude: -117.0231 },
  { agency: 'harborview', storeNumber: 115, street: '302 Station Road', city: 'El Cajon', region: 'CA', postalCode: '92020', latitude: 32.7948, longitude: -116.9625 },
  { agency: 'harborview', storeNumber: 118, street: '9100 Park Boulevard', city: 'Santee', region: 'CA', postalCode: '92071', latitude: 32.8384, longitude: -116.9739 },
  { agency: 'harborview', storeNumber: 122, street: '13250 Orchard Lane', city: 'Poway', region: 'CA', postalCode: '92064', latitude: 32.9628, longitude: -117.0359 },
  { agency: 'harborview', storeNumber: 126, street: '455 Valley Parkway', city: 'Escondido', region: 'CA', postalCode: '92025', latitude: 33.1192, longitude: -117.0864 },
  { agency: 'harborview', storeNumber: 129, street: '1020 Campus Drive', city: 'San Marcos', region: 'CA', postalCode: '92069', latitude: 33.1434, longitude: -117.1661 },
  { agency: 'harborview', storeNumber: 133, street: '6010 Sunset Road', city: 'Carlsbad', region: 'CA', postalCode: '92008', latitude: 33.1581, longitude: -117.3506 },
  { agency: 'harborview', storeNumber: 137, street: '2230 Mission Avenue', city: 'Oceanside', region: 'CA', postalCode: '92054', latitude: 33.1959, longitude: -117.3795 },
  { agency: 'harborview', storeNumber: 142, street: '27100 Vineyard Road', city: 'Temecula', region: 'CA', postalCode: '92590', latitude: 33.4936, longitude: -117.1484 },
  { agency: 'prairie', storeNumber: 201, street: '1700 Rock Road', city: 'Derby', region: 'KS', postalCode: '67037', latitude: 37.5456, longitude: -97.2689 },
  { agency: 'prairie', storeNumber: 205, street: '640 Grand Avenue', city: 'Haysville', region: 'KS', postalCode: '67060', latitude: 37.5645, longitude: -97.3523 },
  { agency: 'prairie', storeNumber: 208, street: '215 Cloud Avenue', city: 'Andover', region: 'KS', postalCode: '67002', latitude: 37.7139, longitude: -97.1364 },
  { agency: 'prairie', storeNumber: 212, street: '6301 Meadow Street', city: 'Park City', region: 'KS', postalCode: '67219', latitude: 37.8, longitude: -97.3184 },
  { agency: 'prairie', storeNumber: 216, street: '1100 Main Street', city: 'Newton', region: 'KS', postalCode: '67114', latitude: 38.0467, longitude: -97.345 },
  { agency: 'prairie', storeNumber: 219, street: '420 Ohio Street', city: 'Augusta', region: 'KS', postalCode: '67010', latitude: 37.6867, longitude: -96.9767 },
  { agency: 'prairie', storeNumber: 223, street: '2501 Central Avenue', city: 'El Dorado', region: 'KS', postalCode: '67042', latitude: 37.8172, longitude: -96.862 },
  { agency: 'prairie', storeNumber: 227, street: '918 Washington Avenue', city: 'Wellington', region: 'KS', postalCode: '67152', latitude: 37.2653, longitude: -97.3717 },
  { agency: 'prairie', storeNumber: 231, street: '1601 Industrial Parkway', city: 'Winfield', region: 'KS', postalCode: '67156', latitude: 37.2397, longitude: -96.9956 },
  { agency: 'prairie', storeNumber: 236, street: '3300 Harvest Drive', city: 'Hutchinson', region: 'KS', postalCode: '67501', latitude: 38.0608, longitude: -97.9298 },
  { agency: 'prairie', storeNumber: 240, street: '1450 Kansas Avenue', city: 'McPherson', region: 'KS', postalCode: '67460', latitude: 38.3708, longitude: -97.6642 },
  { agency: 'prairie', storeNumber: 244, street: '2800 Ninth Street', city: 'Salina', region: 'KS', postalCode: '67401', latitude: 38.8403, longitude: -97.6114 },
];

/** The comment a reviewer writes with each return reason used in the scenario. */
export const returnReasonSeeds = {
  missing_evidence: 'The serial plate photo is missing or unreadable. Please add a clear photo of the plate and resubmit.',
  readings_missing: 'A calibration claim needs the after-repair readings. Please enter them and resubmit.',
  labor_over_guide: 'Hours are well above the labor-time guide for this repair. Add a note explaining the extra time or correct the hours.',
  incomplete_information: 'The cause and correction do not say which part failed. Please describe the failure and what was replaced.',
} as const satisfies Partial<Record<ReasonCode, string>>;

/** The denials of the scenario: which reason code, and the reviewer's comment. */
export const denialSeeds = {
  out_of_coverage: {
    reason: 'outside_coverage',
    comment: 'The unit was past its coverage on the failure date (counted from install and capped from ship).',
  },
  filed_late: {
    reason: 'filed_late',
    comment: 'The claim arrived after the filing window of the contract terms in force on the repair date.',
  },
  liquid_damage: {
    reason: 'not_a_warranty_failure',
    comment: 'The failed board shows damage from liquid spilled into the control compartment; that is not a defect in material or workmanship.',
  },
  installation_fault: {
    reason: 'not_a_warranty_failure',
    comment: 'The unit was connected to the wrong supply voltage at installation; installation faults go to the installer.',
  },
} as const satisfies Record<string, { reason: ReasonCode; comment: string }>;
