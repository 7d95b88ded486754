import { businessDay } from '@shared/calculations/business-day';
import { daysBetween } from '@shared/calculations/dates';
const moneyFormats = new Map<string, Intl.NumberFormat>();

function moneyFormat(currency: string): Intl.NumberFormat {
  let f = moneyFormats.get(currency);
  if (!f) {
    try {
      f = new Intl.NumberFormat('en-US', { style: 'currency', currency, currencyDisplay: 'narrowSymbol' });
    } catch {
      f = new Intl.NumberFormat('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
    }
    moneyFormats.set(currency, f);
  }
  return f;
}

/** Integer cents shown in the claim's currency: 123456 USD -> "$1,234.56". */
export function formatCents(cents: number | null | undefined, currency: string): string {
  if (cents === null || cents === undefined) return '—';
  const digits = moneyFormat(currency).resolvedOptions().maximumFractionDigits ?? 2;
  return moneyFormat(currency).format(cents / 10 ** digits);
}

const dateFormat = new Intl.DateTimeFormat('en-US', { year: 'numeric', month: 'short', day: 'numeric', timeZone: 'UTC' });
const dateTimeFormat = new Intl.DateTimeFormat('en-US', { year: 'numeric', month: 'short', day: 'numeric', hour: 'numeric', minute: '2-digit' });

/** A calendar date "2026-03-31" -> "Mar 31, 2026" (read as a calendar day, never shifted by time zone). */
export function formatDate(date: string | null | undefined): string {
  if (!date) return '—';
  const d = new Date(/^\d{4}-\d{2}-\d{2}$/.test(date) ? `${date}T00:00:00Z` : date);
  return Number.isNaN(d.getTime()) ? date : dateFormat.format(d);
}

/** A UTC timestamp shown in the viewer's local time. */
export function formatDateTime(ts: string | null | undefined): string {
  if (!ts) return '—';
  const d = new Date(ts);
  return Number.isNaN(d.getTime()) ? ts : dateTimeFormat.format(d);
}

/**
 * Whole business days from `since` (date or timestamp) to now, never negative: calendar days in
 * the organisation's time zone (a claim submitted at 23:30 is one day old after midnight there).
 */
export function ageInDays(since: string | null | undefined, now: Date = new Date(), timeZone = 'UTC'): number | null {
  if (!since) return null;
  try {
    const from = /^\d{4}-\d{2}-\d{2}$/.test(since) ? since : businessDay(since, timeZone);
    return Math.max(0, daysBetween(from, businessDay(now, timeZone)));
  } catch {
    return null;
  }
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(0)} KB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

export function formatHours(h: number | null | undefined): string {
  if (h === null || h === undefined) return '—';
  return `${Number(h.toFixed(2))} h`;
}
