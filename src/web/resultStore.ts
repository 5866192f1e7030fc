/** What the page shows beside the pane: the written sheets, the loaded data (for "go to cell"), and a highlighted cell. */
import type { SheetSpec } from '../core/report/types';
import type { DataSource } from '../taskpane/actions';
import type { PrintStamp } from '../files';
import type { ReportFile } from './workerEngine';

export interface HighlightedCell {
  /** The address as given, e.g. "'egfr-visits'!F17". */
  readonly address: string;
  /** 0-based row index into the source's cells (0 is the header row). */
  readonly rowIndex: number;
  /** 0-based column index into the source's cells. */
  readonly colIndex: number;
}

export interface PageState {
  /** The sheets of the last run, each with the unique name it was given. */
  readonly sheets: readonly {
    readonly name: string;
    readonly spec: SheetSpec;
    /** Per block, the table's full row count where the page's copy holds only its first rows (pageView.ts). */
    readonly tableRows?: readonly (number | null)[];
  }[];
  readonly source: DataSource | null;
  readonly highlight: HighlightedCell | null;
  /** A message about a cell address the page could not show, or null. */
  readonly notice: string | null;
  /** The headers the last run read (a blinded run reads no arm column, so the page shows none); null shows all. */
  readonly shownHeaders: readonly string[] | null;
  /** The last run's date and input fingerprint, for the footer of the downloaded report's printed pages. */
  readonly stamp: PrintStamp;
  /** Writes the last run's report (.xlsx): in the engine worker on the page; null before a run. */
  readonly report: (() => Promise<ReportFile>) | null;
}

/** Someone waiting for the current sheets to be drawn (ResultStore.drawn). */
interface DrawWaiter {
  readonly sheets: PageState['sheets'];
  readonly onProgress: ((fraction: number) => void) | undefined;
  readonly resolve: () => void;
}

/**
 * A tiny observable holder, read by React through useSyncExternalStore. The view that draws the sheets (ResultsView)
 * draws them one task at a time and says how far it is (sheetsDrawn), so a run can wait until its sheets are on the
 * page (drawn) and show that as progress.
 */
export class ResultStore {
  private state: PageState = { sheets: [], source: null, highlight: null, notice: null, shownHeaders: null, stamp: {}, report: null };
  private readonly listeners = new Set<() => void>();
  private waiters: DrawWaiter[] = [];
  /** The sheets the view has drawn whole, and how many of them (reported by the view). */
  private drawnOf: { readonly sheets: PageState['sheets']; readonly count: number } | null = null;
  /** Views that draw the sheets (they report progress). */
  private drawers = 0;

  readonly subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  readonly get = (): PageState => this.state;

  update(patch: Partial<PageState>): void {
    this.state = { ...this.state, ...patch };
    // Waiting for sheets that are no longer shown ends.
    if (patch.sheets !== undefined) this.release((w) => w.sheets !== this.state.sheets);
    for (const l of this.listeners) l();
  }

  /** A view that draws the sheets is mounted (returns its removal); while none is, drawn() resolves at once. */
  addDrawer(): () => void {
    this.drawers += 1;
    return () => {
      this.drawers -= 1;
      if (this.drawers === 0) this.release(() => true);
    };
  }

  /** The view reports that the first `count` of `sheets` are drawn. */
  sheetsDrawn(sheets: PageState['sheets'], count: number): void {
    this.drawnOf = { sheets, count };
    const total = Math.max(1, sheets.length);
    for (const w of this.waiters) if (w.sheets === sheets) w.onProgress?.(Math.min(1, count / total));
    this.release((w) => w.sheets === sheets && count >= sheets.length);
  }

  /**
   * Resolves once the current sheets are all drawn on the page (at once when no view draws them, or when they were
   * replaced meanwhile), reporting the fraction drawn as it goes.
   */
  drawn(onProgress?: (fraction: number) => void): Promise<void> {
    const sheets = this.state.sheets;
    if (this.drawers === 0 || sheets.length === 0 || (this.drawnOf?.sheets === sheets && this.drawnOf.count >= sheets.length)) return Promise.resolve();
    return new Promise<void>((resolve) => this.waiters.push({ sheets, onProgress, resolve }));
  }

  private release(which: (w: DrawWaiter) => boolean): void {
    const done = this.waiters.filter(which);
    this.waiters = this.waiters.filter((w) => !which(w));
    for (const w of done) w.resolve();
  }
}

/**
 * The headers a run read, from its results JSON (settings.mapping: role → header, covariates → headers), when the
 * run was blinded; null otherwise (an unblinded run may show every column). Example: a blinded run with mapping
 * { subject: 'USUBJID', value: 'AVAL', covariates: [] } gives ['USUBJID', 'AVAL'].
 */
export function blindedHeaders(json: Record<string, unknown>): string[] | null {
  const settings = json.settings as { mode?: unknown; mapping?: Record<string, unknown> } | undefined;
  if (settings?.mode !== 'blinded') return null;
  const out: string[] = [];
  for (const value of Object.values(settings.mapping ?? {})) {
    if (typeof value === 'string') out.push(value);
    else if (Array.isArray(value)) out.push(...value.filter((v): v is string => typeof v === 'string'));
  }
  return out;
}

/** The DOM id of a sheet's section on the page (letters, digits and "-" only). */
export function sheetDomId(name: string): string {
  return `sheet-${name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;
}
