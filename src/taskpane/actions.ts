/**
 * What the task pane asks of its host. The Excel adapter (src/excel) and the browser page (src/web) each implement
 * this; the React components receive it as a prop and never touch Office globals or the file system.
 */
import type { CellValue, DateSystem } from '../core/intake/types';
import type { AnalysisOutput, AnalysisSettings } from '../core/pipeline/types';
import type { ScheduleVisit } from '../core/schedule/types';

/** A block of cells read from the host, with where it came from. */
export interface DataSource {
  /** Human label, e.g. "Visits!A1:H2401" or "egfr-visits.csv". */
  readonly label: string;
  readonly sheet: string;
  /** Address of the header row's first cell, e.g. "A1". */
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly cells: readonly (readonly CellValue[])[];
  /** How intake should treat numbers written as text: 'accept' for CSV files (every field is text), 'reject' (the
   * default) for spreadsheet cells, where a number stored as text is a problem worth reporting. */
  readonly numericText?: 'reject' | 'accept';
  /** Warnings about the file itself (a repaired encoding, fields past the header), each led by its first cell; they
   * go into the run's notes. */
  readonly fileNotes?: readonly string[];
}

export interface ScheduleSource {
  /** Sheet name (Excel) or file name (page). */
  readonly name: string;
}

export type ScheduleLoad =
  | { readonly ok: true; readonly schedule: readonly ScheduleVisit[] }
  | { readonly ok: false; readonly message: string };

/** Settings the pane remembers between runs (in the workbook's settings, or the page's memory). */
export interface SavedSettings {
  readonly mapping?: AnalysisSettings['mapping'];
  readonly scheduleSource?: string;
  readonly settings?: Partial<Pick<AnalysisSettings, 'mode' | 'referenceArm' | 'timeUnit' | 'dfMethod' | 'method' | 'model' | 'level' | 'cutoff'>>;
}

export interface WrittenSheet {
  /** The name the sheet actually got (unique in the workbook). */
  readonly name: string;
  readonly title: string;
}

export interface PaneActions {
  /** 'selection' | 'usedRange' in Excel; 'file' on the page (the file is passed). */
  readonly sourceKinds: readonly ('selection' | 'usedRange' | 'file')[];
  loadData(kind: 'selection' | 'usedRange' | 'file', file?: File, onProgress?: (fraction: number) => void): Promise<DataSource>;
  listScheduleSources(): Promise<readonly ScheduleSource[]>;
  loadSchedule(name: string, file?: File): Promise<ScheduleLoad>;
  /** Writes a starter schedule (sheet or download) and returns its name. */
  createStarterSchedule(): Promise<string>;
  /** Writes the output's sheets as new sheets (Excel) or keeps them for HTML and download (page). */
  writeResults(output: Extract<AnalysisOutput, { ok: true }>, onProgress?: (fraction: number) => void): Promise<readonly WrittenSheet[]>;
  /** Shows a result sheet (activates it in Excel; scrolls to it on the page). */
  showSheet(name: string): Promise<void>;
  /** Selects a cell given as "Sheet!C17" (Excel) or highlights the row (page). */
  selectCell(address: string): Promise<void>;
  loadSaved(): Promise<SavedSettings | null>;
  save(settings: SavedSettings): Promise<void>;
}
