/**
 * The paid-claims CSV: one record per paid claim, the columns of `paidClaimsExportColumns`.
 *
 * - RFC 4180 section 2: records end in CRLF; a header line; a field holding a comma, a double
 *   quote, CR or LF is enclosed in double quotes, an inner quote doubled (`"b""bb"`). csv-stringify
 *   quotes the delimiter and the quote itself but, with a CRLF record delimiter, not a lone CR or
 *   LF, so `quoted_match` adds those. UTF-8 without a byte-order mark.
 * - OWASP "CSV Injection": a text cell that begins with = + - @, tab, CR or LF would be read as a
 *   formula by a spreadsheet, so it gets a leading single quote (`=1+2` becomes `'=1+2`).
 *   Amount cells are exempt: they are generated here from integer cents as plain decimals
 *   (`1234.50`), never from user text. Approved amounts are never negative (they are sums of
 *   line amounts of zero or more); were a negative amount ever written it would read `-12.34`,
 *   a number and not a formula, so it is left as it is rather than turned into text.
 */
import type { Options } from 'csv-stringify';
import { centsToDecimalString } from '@shared/calculations/money';
import { paidClaimsExportColumns } from '@shared/schemas/payment';

export const paidClaimsHeader = paidClaimsExportColumns.map((c) => c.key);

/** csv-stringify options shared by the streamed export and the remittance attachment. */
export const csvOptions: Options = {
  header: true,
  columns: paidClaimsHeader,
  record_delimiter: 'windows',
  quoted_match: /[\r\n]/,
};

const EQUALS = 0x3d;
const PLUS = 0x2b;
const MINUS = 0x2d;
const AT = 0x40;
const TAB = 0x09;
const CR = 0x0d;
const LF = 0x0a;

/** OWASP CSV-injection guard for one text cell. */
export function neutraliseCell(value: string | null | undefined): string {
  if (value === null || value === undefined || value === '') return '';
  const c = value.charCodeAt(0);
  return c === EQUALS || c === PLUS || c === MINUS || c === AT || c === TAB || c === CR || c === LF ? `'${value}` : value;
}

/**
 * The database row as the export query selects it (raw array, in this order): number, agency,
 * technician, serial, model, repair date, run number, payment date, reference, labor, travel,
 * parts, total (cents), currency.
 */
export type PaidClaimRow = [
  string,
  string,
  string,
  string | null,
  string | null,
  string | null,
  string,
  string | null,
  string | null,
  number,
  number,
  number,
  number,
  string,
];

const amount = (cents: number | null) => centsToDecimalString(cents ?? 0);

/**
 * One CSV record from one row, written into the row's own array: the export turns a hundred
 * thousand rows into records, and not allocating a second array per row keeps it lean.
 */
export function paidClaimRecord(r: PaidClaimRow): string[] {
  const out = r as unknown as string[];
  for (let i = 0; i < 9; i++) out[i] = neutraliseCell(r[i] as string | null);
  out[9] = amount(r[9]);
  out[10] = amount(r[10]);
  out[11] = amount(r[11]);
  out[12] = amount(r[12]);
  out[13] = neutraliseCell(r[13]);
  return out;
}
