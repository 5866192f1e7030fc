/**
 * Collects intake issues with their cell addresses and rendered sentences, so readers of a range report every problem
 * in one shape. Data row i of a range whose header row starts at `topLeft` sits on worksheet row top.row + 1 + i.
 */
import { formatAddress, type CellRef } from './cellAddress';
import { renderMessage } from './messages';
import type { Issue, IssueCode, Role, Severity, Use } from './types';

export class IssueList {
  readonly items: Issue[] = [];
  private errors = 0;

  constructor(
    private readonly sheet: string,
    private readonly top: CellRef,
  ) {}

  /** Issues found earlier (e.g. while decoding), kept in their order. */
  addAll(items: readonly Issue[]): void {
    for (const item of items) {
      this.items.push(item);
      if (item.severity === 'error') this.errors++;
    }
  }

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

  /** The one summary warning for every blank data row: `spans` are inclusive worksheet-row spans in order, the first
   * starting at data row `firstDataRow`. The rows are left out of both uses (the excluded-row list expands the spans). */
  blankRows(firstDataRow: number, spans: readonly (readonly [number, number])[]): void {
    const row = this.top.row + 1 + firstDataRow;
    const cell = formatAddress(this.sheet, row, this.top.col);
    let count = 0;
    for (const [a, b] of spans) count += b - a + 1;
    const message = renderMessage({ code: 'blank-row', role: null, value: '', cell, use: null, context: String(count), other: spanWords(spans) });
    this.items.push({ code: 'blank-row', severity: 'warning', cell, row, role: null, value: '', use: null, message, rowSpans: spans });
  }

  get hasErrors(): boolean {
    return this.errors > 0;
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
    if (severity === 'error') this.errors++;
  }
}

/** Spans of rows in words, at most three named: "122–1,048,576", "5, 9–12, 30 and 4 more spans". */
export function spanWords(spans: readonly (readonly [number, number])[]): string {
  const fmt = (n: number): string => n.toLocaleString('en-US');
  const named = spans.slice(0, 3).map(([a, b]) => (a === b ? fmt(a) : `${fmt(a)}–${fmt(b)}`));
  const more = spans.length - named.length;
  return more > 0 ? `${named.join(', ')} and ${fmt(more)} more span${more === 1 ? '' : 's'}` : named.join(', ');
}
