import { claimKeys } from './claim-keys';
import { claimDetailQuery } from './get-claim';
import { claimListQuery } from './get-claims';
import { claimValuationQuery } from './get-claim-valuation';

/** One options object per read, shared by loaders, components and invalidation. */
export const claimQueries = {
  keys: claimKeys,
  list: claimListQuery,
  detail: claimDetailQuery,
  valuation: claimValuationQuery,
};
