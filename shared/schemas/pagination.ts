import { z } from 'zod';

export const pageSizeSchema = z.coerce.number().int().min(1).max(100).default(50);

export interface Page<T> {
  items: T[];
  nextCursor: string | null;
  total: number;
}
