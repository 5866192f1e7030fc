/**
 * A small recording fake of the few Excel objects the renderer uses (worksheets, ranges, tables, charts, freeze
 * panes). office-addin-mock cannot record the order of property writes on objects that methods create on the fly
 * (getRange(address) returning a new range each time), and the formula guard is about exactly that order, so this
 * fake logs every write in order instead. It keeps the real API's shape; it does not check load/sync (the mock-based
 * tests do that for reads).
 */

export type Op =
  | { readonly op: 'addSheet'; readonly name: string }
  | { readonly op: 'getItem'; readonly name: string }
  | { readonly op: 'numberFormat'; readonly sheet: string; readonly address: string; readonly value: unknown[][] }
  | { readonly op: 'values'; readonly sheet: string; readonly address: string; readonly value: unknown[][] }
  | { readonly op: 'font'; readonly sheet: string; readonly address: string; readonly key: string; readonly value: unknown }
  | { readonly op: 'columnWidth'; readonly sheet: string; readonly address: string; readonly value: number }
  | { readonly op: 'merge'; readonly sheet: string; readonly address: string; readonly across: boolean | undefined }
  | { readonly op: 'format'; readonly sheet: string; readonly address: string; readonly key: 'wrapText' | 'verticalAlignment' | 'rowHeight'; readonly value: unknown }
  | { readonly op: 'table'; readonly sheet: string; readonly address: string; readonly hasHeaders: boolean; name?: string }
  | { readonly op: 'chart'; readonly sheet: string; readonly type: string; readonly address: string; readonly by: string; readonly chart: FakeChart }
  | { readonly op: 'freezeRows'; readonly sheet: string; readonly value: number }
  | { readonly op: 'validation'; readonly sheet: string; readonly address: string; readonly key: string; readonly value: unknown }
  | { readonly op: 'hyperlink'; readonly sheet: string; readonly address: string; readonly value: unknown }
  | { readonly op: 'activate'; readonly sheet: string }
  | { readonly op: 'style'; readonly sheet: string; readonly address: string; readonly value: string }
  | { readonly op: 'styleAdd'; readonly name: string }
  | { readonly op: 'styleSet'; readonly name: string; readonly key: string; readonly value: unknown }
  | { readonly op: 'sync' };

export interface FakeChart {
  name?: string;
  title: { text?: string };
  axes: { categoryAxis: { title: { text?: string } }; valueAxis: { title: { text?: string } } };
  series: { getItemAt(i: number): FakeSeries };
  readonly seriesMade: FakeSeries[];
  position?: [string, string];
  setPosition(a: string, b: string): void;
}

export interface FakeSeries {
  readonly index: number;
  xAxis?: string;
  markerStyle?: string;
  format: { line: { lineStyle?: string } };
  setXAxisValues(r: { address: string }): void;
}

export interface FakeWorkbook {
  readonly ops: Op[];
  readonly runs: () => number;
  /** Sheets in tab order, existing ones first. */
  readonly sheets: string[];
  /** Values that reached the sheet (writes in requests that synced without error), keyed "Sheet!A1". */
  readonly cells: Map<string, unknown>;
}

/** 0-based column and 1-based row of the first cell of an A1 address. */
function firstCell(address: string): { col: number; row: number } {
  const m = /^([A-Z]+)(\d+)/.exec(address);
  if (!m) throw new Error(`bad address ${address}`);
  let col = 0;
  for (const ch of m[1] ?? '') col = col * 26 + (ch.charCodeAt(0) - 64);
  return { col: col - 1, row: Number(m[2]) };
}

function letters(col: number): string {
  let n = col + 1;
  let out = '';
  while (n > 0) {
    out = String.fromCharCode(65 + ((n - 1) % 26)) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

/** `refuseValuesOver`: a sync fails with a payload-size error when any values write in it has more rows than this.
 * `withStyles`: the workbook has a style collection (Workbook.styles, Range.style, ExcelApi 1.7); without it, any use
 * of styles fails as in a host that refuses them. */
export function installFakeExcel(existingSheets: string[], existingTables: string[] = [], refuseValuesOver = Infinity, withStyles = false): FakeWorkbook {
  const styleNames = ['Normal', 'Good', 'Bad'];
  const ops: Op[] = [];
  const sheets = [...existingSheets];
  const tables = [...existingTables];
  const cells = new Map<string, unknown>();
  let runs = 0;

  interface Pending {
    rows: number;
    writes: { sheet: string; address: string; value: unknown[][] }[];
  }

  const makeRange = (sheet: string, address: string, pending: Pending) => {
    const font = new Proxy({} as Record<string, unknown>, {
      set(_t, key, value) {
        ops.push({ op: 'font', sheet, address, key: String(key), value });
        return true;
      },
    });
    return {
      address,
      set numberFormat(v: unknown[][]) {
        ops.push({ op: 'numberFormat', sheet, address, value: v });
      },
      set style(v: string) {
        if (!withStyles) throw new Error('Range.style is not available here.');
        if (!styleNames.includes(v)) throw new Error(`No style named ${v}.`);
        ops.push({ op: 'style', sheet, address, value: v });
      },
      set values(v: unknown[][]) {
        pending.rows = Math.max(pending.rows, v.length);
        pending.writes.push({ sheet, address, value: v });
        ops.push({ op: 'values', sheet, address, value: v });
      },
      format: {
        font,
        set columnWidth(v: number) {
          ops.push({ op: 'columnWidth', sheet, address, value: v });
        },
        set wrapText(v: boolean) {
          ops.push({ op: 'format', sheet, address, key: 'wrapText', value: v });
        },
        set verticalAlignment(v: string) {
          ops.push({ op: 'format', sheet, address, key: 'verticalAlignment', value: v });
        },
        set rowHeight(v: number) {
          ops.push({ op: 'format', sheet, address, key: 'rowHeight', value: v });
        },
        autofitColumns() {},
      },
      merge(across?: boolean) {
        ops.push({ op: 'merge', sheet, address, across });
      },
      set hyperlink(v: unknown) {
        ops.push({ op: 'hyperlink', sheet, address, value: v });
      },
      select() {},
      dataValidation: new Proxy({} as Record<string, unknown>, {
        set(_t, key, value) {
          ops.push({ op: 'validation', sheet, address, key: String(key), value });
          return true;
        },
      }),
    };
  };

  const makeSheet = (name: string, pending: Pending) => ({
    name,
    getRange: (address: string) => makeRange(name, address, pending),
    tables: {
      add: (range: { address: string }, hasHeaders: boolean) => {
        const op: Op & { op: 'table' } = { op: 'table', sheet: name, address: range.address, hasHeaders };
        ops.push(op);
        return {
          set name(n: string) {
            op.name = n;
            tables.push(n);
          },
        };
      },
    },
    charts: {
      add: (type: string, range: { address: string }, by: string) => {
        const made: FakeSeries[] = [];
        const chart: FakeChart = {
          title: {},
          axes: { categoryAxis: { title: {} }, valueAxis: { title: {} } },
          seriesMade: made,
          series: {
            getItemAt(i: number) {
              const s: FakeSeries = {
                index: i,
                format: { line: {} },
                setXAxisValues(r) {
                  s.xAxis = r.address;
                },
              };
              made.push(s);
              return s;
            },
          },
          setPosition(a, b) {
            chart.position = [a, b];
          },
        };
        ops.push({ op: 'chart', sheet: name, type, address: range.address, by, chart });
        return chart;
      },
    },
    freezePanes: {
      freezeRows: (n: number) => ops.push({ op: 'freezeRows', sheet: name, value: n }),
    },
    activate: () => ops.push({ op: 'activate', sheet: name }),
  });

  const excel = {
    run: async (callback: (context: unknown) => Promise<unknown>) => {
      runs++;
      const pending: Pending = { rows: 0, writes: [] };
      const context = {
        workbook: {
          worksheets: {
            get items() {
              return sheets.map((n) => ({ name: n }));
            },
            load() {},
            add: (name: string) => {
              if (sheets.some((s) => s.toLowerCase() === name.toLowerCase())) throw new Error(`A sheet named ${name} exists.`);
              sheets.push(name);
              ops.push({ op: 'addSheet', name });
              return makeSheet(name, pending);
            },
            getItem: (name: string) => {
              ops.push({ op: 'getItem', name });
              return makeSheet(name, pending);
            },
          },
          tables: {
            get items() {
              return tables.map((n) => ({ name: n }));
            },
            load() {},
          },
          ...(withStyles
            ? {
                styles: {
                  get items() {
                    return styleNames.map((n) => ({ name: n }));
                  },
                  load() {},
                  add: (name: string) => {
                    if (styleNames.includes(name)) throw new Error(`A style named ${name} exists.`);
                    styleNames.push(name);
                    ops.push({ op: 'styleAdd', name });
                  },
                  getItem: (name: string) =>
                    new Proxy({} as Record<string, unknown>, {
                      set(_t, key, value) {
                        ops.push({ op: 'styleSet', name, key: String(key), value });
                        return true;
                      },
                    }),
                },
              }
            : {}),
          // DATE(1904,1,1) as a 1900-system workbook answers it.
          functions: { date: () => ({ value: 1462, load() {} }) },
        },
        sync: async () => {
          ops.push({ op: 'sync' });
          const writes = pending.writes;
          const refused = pending.rows > refuseValuesOver;
          pending.rows = 0;
          pending.writes = [];
          if (refused) throw Object.assign(new Error('The request payload size has exceeded the limit.'), { code: 'RequestPayloadSizeLimitExceeded' });
          for (const w of writes) {
            const { col, row } = firstCell(w.address);
            w.value.forEach((r, i) => r.forEach((v, j) => cells.set(`${w.sheet}!${letters(col + j)}${row + i}`, v)));
          }
        },
      };
      return callback(context);
    },
  };
  Object.assign(globalThis, { Excel: excel });
  return { ops, runs: () => runs, sheets, cells };
}
