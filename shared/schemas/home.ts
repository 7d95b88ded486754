import type { ClaimListItem } from './claim';

/**
 * GET /api/home: what needs this person's action now. Each card is one queue: a count and
 * its oldest items, plus a link to the filtered list. Cards depend on the role.
 */
export interface HomeCard {
  key: string;
  label: string;
  /** Plain-English hint of what to do, e.g. "Fix and resubmit". */
  hint: string;
  count: number;
  /** Up to 5, oldest first. */
  items: ClaimListItem[];
  /** Client path with filters, e.g. "/claims?state=returned". */
  href: string;
  tone: 'action' | 'info' | 'warning';
  /**
   * `queue`: claims waiting for someone, listed oldest first ("Nothing waiting" when empty).
   * `count`: a plain number of things (catalogue entries, users, open payment runs) with no list.
   */
  kind: 'queue' | 'count';
  /**
   * Which amount the listed claims show: `approved` (what the reviewer approved, on queues of
   * approved claims) or `allowed` (what the rules allow, the amount the claim stands for on submit).
   */
  amount: 'approved' | 'allowed';
}

export interface HomeResponse {
  role: string;
  cards: HomeCard[];
  /** Short notices, e.g. certifications expiring soon, overdue part returns. */
  notices: { key: string; message: string; href?: string; tone: 'info' | 'warning' }[];
}
