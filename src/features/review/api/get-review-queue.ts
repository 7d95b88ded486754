import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimListItem } from '@shared/schemas/claim';
import type { Page } from '@shared/schemas/pagination';
import { api } from '@/lib/api-client';
import { queueQuery, type ReviewQueueFilters } from '../queue-filters';
import { reviewKeys } from './review-keys';

export type ReviewQueuePage = Page<ClaimListItem>;

/** GET /api/claims with the queue's states, oldest submission first, and its filters. */
export function getReviewQueue(filters: ReviewQueueFilters, signal?: AbortSignal): Promise<ReviewQueuePage> {
  return api.get<ReviewQueuePage>('/api/claims', queueQuery(filters), signal);
}

export function reviewQueueQuery(filters: ReviewQueueFilters) {
  return queryOptions({ queryKey: reviewKeys.queue(filters), queryFn: ({ signal }) => getReviewQueue(filters, signal) });
}

export function useReviewQueue(filters: ReviewQueueFilters) {
  return useQuery({ ...reviewQueueQuery(filters), placeholderData: keepPreviousData });
}
