import { assertKey } from './storage';

const SAFE_ID = /^[A-Za-z0-9-]{1,64}$/;

function id(value: string, what: string): string {
  if (!SAFE_ID.test(value)) throw new Error(`Unsafe ${what} for a storage key: ${JSON.stringify(value)}`);
  return value;
}

/**
 * Server-generated object keys: the organisation first, so each tenant's files sit under
 * their own prefix, then the claim, then the attachment id. The client's name is never used.
 */
export function attachmentKey(organisationId: string, claimId: string, attachmentId: string, ext: string): string {
  if (!/^[a-z0-9]{2,5}$/.test(ext)) throw new Error(`Unsafe extension: ${ext}`);
  const key = `orgs/${id(organisationId, 'organisation id')}/claims/${id(claimId, 'claim id')}/${id(attachmentId, 'attachment id')}.${ext}`;
  assertKey(key);
  return key;
}

export function thumbnailKey(organisationId: string, claimId: string, attachmentId: string): string {
  const key = `orgs/${id(organisationId, 'organisation id')}/claims/${id(claimId, 'claim id')}/${id(attachmentId, 'attachment id')}.thumb.jpg`;
  assertKey(key);
  return key;
}

export const ATTACHMENT_PREFIX = 'orgs/';
