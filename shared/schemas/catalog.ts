import { z } from 'zod';

/** GET /api/catalog/models|parts|repair-codes?family=<family id or code> */
export const catalogQuerySchema = z.object({
  family: z.string().trim().min(1).max(64).optional(),
});

export interface CatalogFamily {
  id: string;
  code: string;
  name: string;
  fuel: 'gas' | 'electric';
}

export interface CatalogModel {
  id: string;
  modelNumber: string;
  name: string;
  family: CatalogFamily;
  partsMonths: number;
  laborMonths: number;
  capMonthsFromShip: number;
  installGraceDays: number;
  active: boolean;
  readingSpecs: Array<{ id: string; key: string; label: string; unit: string; nominal: number; tolerance: number; phase: 'before' | 'after' | 'both'; requiredForCodes: string[] }>;
  componentTerms: Array<{ partId: string; label: string; partsMonths: number }>;
}

export interface CatalogPart {
  id: string;
  partNumber: string;
  description: string;
  familyId: string | null;
  familyCode: string | null;
  listPriceCents: number;
  returnRequired: boolean;
  active: boolean;
}

export interface CatalogRepairCode {
  id: string;
  code: string;
  description: string;
  familyId: string;
  familyCode: string;
  allowedHours: number;
  requiredEvidence: string[];
  active: boolean;
}

export interface CatalogList<T> {
  items: T[];
}
