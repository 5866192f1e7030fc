/**
 * Collects intake issues with their cell addresses and rendered sentences, so readers of a range report every problem
 * in one shape. Data row i of a range whose header row starts at `topLeft` sits on worksheet row top.row + 1 + i.
 */
import { formatAddress, type CellRef } from './cellAddress';
import { renderMessage } from './messages';
import type { Issue, IssueCode, Role, Severity, Use } from './types';

export class IssueList {
  readonly items: Issue[] = [];

  constructor(
    private readonly sheet: string,
    private readonly top: CellRef,
  ) {}

  /** An issue about the whole range or the mapping (no cell, no row). */
  range(code: IssueCode, severity: Severity, role: Role | null, value: string, use: Use | null, context?: string): void {
    this.push(code, severity, null, null, role, value, use, context);
  }

  /** An issue about the header cell of range column `col`. */
  header(code: IssueCode, severity: Severity, col: number, role: Role | null, value: string, context?: string, other?: string): void {
    this.push(code, severity, formatAddress(this.sheet, this.top.row, this.top.col + col), null, role, value, null, context, other);
  }

  /** An issue about data row `dataRow` (0-based), range column `col`. */
  at(
    code: IssueCode,
    severity: Severity,
    dataRow: number,
    col: number,
    role: Role | null,
    value: string,
    use: Use | null,
    context?: string,
    other?: string,
  ): void {
    const row = this.top.row + 1 + dataRow;
    this.push(code, severity, formatAddress(this.sheet, row, this.top.col + col), row, role, value, use, context, other);
  }

  get hasErrors(): boolean {
    return this.items.some((i) => i.severity === 'error');
  }

  private push(
    code: IssueCode,
    severity: Severity,
    cell: string | null,
    row: number | null,
    role: Role | null,
    value: string,
    use: Use | null,
    context: string | undefined,
    other?: string,
  ): void {
    const message = renderMessage({
      code,
      role,
      value,
      cell,
      use,
      ...(context === undefined ? {} : { context }),
      ...(other === undefined ? {} : { other }),
    });
    this.items.push({ code, severity, cell, row, role, value, use, message });
  }
}
