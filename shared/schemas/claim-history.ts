import type { SnapshotChange } from '../workflow/submission-diff';

/** GET /api/claims/:id/changes: what changed between the last two submissions. */
export interface SubmissionChanges {
  /** Submissions counted (at most the last two are read). */
  submissions: number;
  previousAt: string | null;
  latestAt: string | null;
  changes: SnapshotChange[];
  /** The earlier submission was made before snapshots were kept. */
  unrecorded?: boolean;
}
