import type { z } from 'zod';
import { fieldErrorsFrom } from '@shared/schemas/api-error';
import { ValidationError } from '../lib/errors';

/** Parses with the shared zod schema; the result holds only allow-listed fields. */
export function parseBody<S extends z.ZodType>(schema: S, body: unknown): z.infer<S> {
  const r = schema.safeParse(body ?? {});
  if (!r.success) throw new ValidationError('Some fields need attention.', fieldErrorsFrom(r.error));
  return r.data;
}

export function parseQuery<S extends z.ZodType>(schema: S, query: unknown): z.infer<S> {
  const r = schema.safeParse(query ?? {});
  if (!r.success) throw new ValidationError('Some filters are not valid.', fieldErrorsFrom(r.error));
  return r.data;
}
