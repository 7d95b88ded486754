/**
 * Query keys of the evidence feature. They sit under the claim's own key
 * (['claims', 'detail', id]), so invalidating ['claims'] refreshes the evidence too.
 */
export const evidenceKeys = {
  claim: (claimId: string) => ['claims', 'detail', claimId] as const,
  evidence: (claimId: string) => ['claims', 'detail', claimId, 'evidence'] as const,
  readings: (claimId: string) => ['claims', 'detail', claimId, 'readings-report'] as const,
};
