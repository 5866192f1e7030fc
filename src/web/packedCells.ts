/**
 * A block of cells in a compact form that crosses from the engine worker to the page cheaply, and the page's view of
 * it. Each column is its distinct values (a table) and one 32-bit code per row into that table, in transferable
 * buffers; so the page holds some thousands of values and a few typed arrays instead of one object per cell (at
 * 300,000 rows × 10 columns, three million strings whose garbage collection alone froze the page for most of a
 * second). The page's view builds a row only when it is asked for.
 */
import type { CellValue } from '../core/intake/types';

type Cells = readonly (readonly CellValue[])[];

export interface PackedColumn {
  /** The column's distinct values; code k (k ≥ 1) stands for values[k - 1], code 0 for a row too short to have it. */
  readonly values: readonly CellValue[];
  readonly codes: Uint32Array;
}

export interface PackedCells {
  readonly rowCount: number;
  readonly columns: readonly PackedColumn[];
  /** Each row's length when the rows are not all as long as the widest, else null. */
  readonly lengths: Uint32Array | null;
}

/** Key of a value in a column's table: values as they are (Map keys are compared as SameValueZero), except −0,
 * which would otherwise fall together with 0. */
const MINUS_ZERO = Symbol('-0');
const keyOf = (v: CellValue): unknown => (Object.is(v, -0) ? MINUS_ZERO : v);

/** Packs cells (rows of any lengths). Cost O(cells). Example: [['a', 1], ['a']] → columns [{ values: ['a'], codes
 * [1, 1] }, { values: [1], codes [1, 0] }], lengths [2, 1]. */
export function packCells(cells: Cells): PackedCells {
  const rowCount = cells.length;
  let width = 0;
  let ragged = false;
  for (const row of cells) width = Math.max(width, row.length);
  for (const row of cells) if (row.length !== width) ragged = true;
  const columns: PackedColumn[] = [];
  for (let c = 0; c < width; c++) {
    const table = new Map<unknown, number>();
    const values: CellValue[] = [];
    const codes = new Uint32Array(rowCount);
    for (let r = 0; r < rowCount; r++) {
      const row = cells[r]!;
      if (c >= row.length) continue;
      const v = row[c] as CellValue;
      const key = keyOf(v);
      let code = table.get(key);
      if (code === undefined) {
        values.push(v);
        code = values.length;
        table.set(key, code);
      }
      codes[r] = code;
    }
    columns.push({ values, codes });
  }
  const lengths = ragged ? Uint32Array.from(cells, (row) => row.length) : null;
  return { rowCount, columns, lengths };
}

/** The buffers of a packed block, to transfer with it. */
export function packedBuffers(packed: PackedCells): ArrayBuffer[] {
  const out = packed.columns.map((c) => c.codes.buffer as ArrayBuffer);
  if (packed.lengths !== null) out.push(packed.lengths.buffer as ArrayBuffer);
  return out;
}

/** One row of a packed block as an array. */
export function packedRow(packed: PackedCells, r: number): CellValue[] {
  const n = packed.lengths === null ? packed.columns.length : (packed.lengths[r] ?? 0);
  const row = new Array<CellValue>(n);
  for (let c = 0; c < n; c++) {
    const column = packed.columns[c]!;
    row[c] = column.values[(column.codes[r] ?? 1) - 1] ?? null;
  }
  return row;
}

/**
 * The packed block seen as rows of cells (read only): `length`, indexing, iteration and the array methods work as
 * on an array of arrays; each row is built when it is read, the header row once. Cost O(columns) per row read.
 */
export function unpackCells(packed: PackedCells): Cells {
  const header = packed.rowCount > 0 ? packedRow(packed, 0) : undefined;
  const rowAt = (index: number): CellValue[] | undefined =>
    index === 0 ? header : index > 0 && index < packed.rowCount ? packedRow(packed, index) : undefined;
  const target: CellValue[][] = [];
  return new Proxy(target, {
    get(t, prop, receiver) {
      if (prop === 'length') return packed.rowCount;
      if (typeof prop === 'string') {
        const index = Number(prop);
        if (Number.isInteger(index) && String(index) === prop) return rowAt(index);
      }
      return Reflect.get(t, prop, receiver) as unknown;
    },
    has(t, prop) {
      if (typeof prop === 'string') {
        const index = Number(prop);
        if (Number.isInteger(index) && String(index) === prop) return index >= 0 && index < packed.rowCount;
      }
      return Reflect.has(t, prop);
    },
    set() {
      return false;
    },
  });
}
