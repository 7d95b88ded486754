import type { ReviewQueueFilters } from '../queue-filters';

/** Under ['claims'], so every claim write (which invalidates ['claims']) refreshes the queue too. */
export const reviewKeys = {
  queue: (filters: ReviewQueueFilters) => ['claims', 'review-queue', filters] as const,
  models: () => ['catalog', 'models', 'all'] as const,
  detail: (id: string) => ['claims', 'detail', id] as const,
  valuation: (id: string) => ['claims', 'detail', id, 'valuation'] as const,
};
