/**
 * Every value that has ever stood in this repository as a session key, a password pepper or a
 * test key (found with `git log -p`). Anyone who has read the source knows them, so none of them
 * may sign sessions or pepper passwords: start-up refuses each one. Add a value here whenever a
 * key is written into the source, a test or a document.
 */
export const PUBLISHED_SECRETS: readonly string[] = [
  // The defaults the configuration once fell back to.
  'fieldproof-local-session-secret-change-me-0001',
  'fieldproof-local-pepper-change-me',
  // Keys and peppers written into tests.
  'test-pepper-0123456789abcdef',
  'a-test-pepper-of-enough-length',
  'another-secret-that-is-long-enough-000000',
  'another-pepper-of-enough-length',
  // Passwords and storage keys of the demo and the tests, never acceptable as a key either.
  'fieldproof-demo',
  'whatever-they-typed',
  'S3RVER',
];

/** True for a value anyone reading the source knows: a published one, or a placeholder asking to be changed. */
export function isPublishedSecret(value: string): boolean {
  const v = value.trim();
  if (PUBLISHED_SECRETS.includes(v)) return true;
  return /change[-_ ]?me/i.test(v);
}
