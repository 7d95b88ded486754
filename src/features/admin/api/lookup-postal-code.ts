import type { PostalCodeLookup } from '@shared/schemas/admin';
import { api, isApiError } from '@/lib/api-client';

/** The offline postal-code table on the server; null when the code is not in it. */
export async function lookupPostalCode(code: string): Promise<PostalCodeLookup | null> {
  try {
    return await api.get<PostalCodeLookup>(`/api/postal-codes/${encodeURIComponent(code.trim())}`);
  } catch (e) {
    if (isApiError(e, 404) || isApiError(e, 400)) return null;
    throw e;
  }
}
