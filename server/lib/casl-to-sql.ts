import { rulesToAST } from '@casl/ability/extra';
import { sql, and, or, not, eq, ne, inArray, notInArray, lt, lte, gt, gte, isNull, isNotNull, type SQL, type Column } from 'drizzle-orm';
import type { AppAbility, Action, Subject } from '@shared/permissions/ability';
import type { Condition } from '@ucast/mongo2js';

/** Maps CASL condition fields to the only columns a rule may constrain. */
export type ColumnAllowList = Record<string, Column>;

/**
 * Turns the user's CASL rules for (action, subject) into one SQL condition, so list queries
 * and single-record reads are filtered by the very rules that guard them. A field outside the
 * allow-list is a programming error and throws, never silently widens access.
 */
export function abilityToSql(ability: AppAbility, action: Action, subject: Subject, columns: ColumnAllowList): SQL {
  const ast = rulesToAST(ability, action, subject as never) as Condition | null;
  if (ast === null) return sql`0 = 1`;
  return walk(ast, columns);
}

function column(columns: ColumnAllowList, field: string | undefined): Column {
  const c = field ? columns[field] : undefined;
  if (!c) throw new Error(`abilityToSql: field "${field}" is not in the allow-list`);
  return c;
}

function walk(node: Condition, columns: ColumnAllowList): SQL {
  const n = node as { operator: string; value: unknown; field?: string };
  switch (n.operator) {
    case 'and': {
      const parts = (n.value as Condition[]).map((c) => walk(c, columns));
      return parts.length === 0 ? sql`1 = 1` : (and(...parts) as SQL);
    }
    case 'or': {
      const parts = (n.value as Condition[]).map((c) => walk(c, columns));
      return parts.length === 0 ? sql`0 = 1` : (or(...parts) as SQL);
    }
    case 'not': {
      const inner = Array.isArray(n.value) ? (n.value as Condition[]).map((c) => walk(c, columns)) : [walk(n.value as Condition, columns)];
      return not(and(...inner) as SQL);
    }
    case 'eq':
      return n.value === null ? isNull(column(columns, n.field)) : eq(column(columns, n.field), n.value);
    case 'ne':
      return n.value === null ? isNotNull(column(columns, n.field)) : ne(column(columns, n.field), n.value);
    case 'in':
      return (n.value as unknown[]).length === 0 ? sql`0 = 1` : inArray(column(columns, n.field), n.value as unknown[]);
    case 'nin':
      return (n.value as unknown[]).length === 0 ? sql`1 = 1` : notInArray(column(columns, n.field), n.value as unknown[]);
    case 'lt':
      return lt(column(columns, n.field), n.value);
    case 'lte':
      return lte(column(columns, n.field), n.value);
    case 'gt':
      return gt(column(columns, n.field), n.value);
    case 'gte':
      return gte(column(columns, n.field), n.value);
    default:
      throw new Error(`abilityToSql: operator "${n.operator}" is not supported`);
  }
}
