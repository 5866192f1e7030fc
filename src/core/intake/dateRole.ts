/**
 * One date role's column, decided and read: the order of numeric dates is decided for the column, the column is read,
 * and a column that cannot be read at all, or whose order cannot be decided, becomes one error at its header cell.
 * Reusable for every date role (visit date, reference date, exit date): give it the column index.
 */
import { readDateColumn, unreadableColumn, type DateColumn } from './dateColumn';
import { decideDateOrder, type DateOrderDecision } from './dateOrder';
import type { IssueList } from './issueList';
import type { CellInput } from './cellSource';
import type { DateOrder, DateReading, DateSystem, Role } from './types';

export interface DateRoleRead {
  readonly column: DateColumn;
  /** The order numeric dates were read in (null when the column has none, or the order could not be decided). */
  readonly order: DateOrder | null;
  /** What the table reports about the order, when the column has numeric dates; else null. */
  readonly reading: DateReading | null;
  /** False when an error about this column was added: the run stops. */
  readonly ok: boolean;
}

const quoteList = (values: readonly string[]): string => values.map((v) => `"${v}"`).join(', ');

/**
 * Decides and reads the date column `col` for `role`, adding at most one error at the header cell:
 * 'date-order-unknown' (every numeric date reads both ways, and no order was given), 'date-order-mixed' (some values
 * read only day first, others only month first) or 'unreadable-date-column' (values, but none is a date or a partial
 * date). O(rows): one cheap pass to decide the order, one to read.
 * @example readDateRole([["ADT"], ["03/04/2025"]], 0, 'date', 'ADT', { dateSystem: 1900 }, issues).ok // false, with 'date-order-unknown' at A1
 */
export function readDateRole(
  cells: CellInput,
  col: number,
  role: Role,
  name: string,
  options: { readonly dateSystem: DateSystem; readonly dateOrder?: DateOrder },
  issues: IssueList,
): DateRoleRead {
  const decision: DateOrderDecision = decideDateOrder(cells, col, options.dateOrder);
  const order = decision.kind === 'decided' ? decision.order : null;
  const column = readDateColumn(cells, col, options.dateSystem, order);
  if (decision.kind === 'ambiguous') {
    issues.header('date-order-unknown', 'error', col, role, name, quoteList(decision.examples));
    return { column, order, reading: null, ok: false };
  }
  if (decision.kind === 'mixed') {
    issues.header('date-order-mixed', 'error', col, role, name, quoteList(decision.dayFirst), quoteList(decision.monthFirst));
    return { column, order, reading: null, ok: false };
  }
  if (unreadableColumn(column)) {
    issues.header('unreadable-date-column', 'error', col, role, name, quoteList(column.examples), column.twoDigitYears ? 'two-digit-year' : undefined);
    return { column, order, reading: null, ok: false };
  }
  const reading: DateReading | null =
    decision.order === null || decision.source === 'none'
      ? null
      : { role, column: name, order: decision.order, source: decision.source, evidence: decision.evidence };
  return { column, order, reading, ok: true };
}
