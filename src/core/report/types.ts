/**
 * The one sheet-spec type every front end renders (Excel adapter, browser page, command line .xlsx).
 * Plain 2-D tables plus number formats and chart specs; no host objects.
 */

/**
 * Number formats by meaning; each front end shows them through formats.ts (formatCell for text, numberFormatFor for a
 * cell's spreadsheet code). Estimates, standard errors, limits, variances and means are 'significant'; counts and
 * study days 'integer'; the fixed-decimal formats are for numbers whose precision is fixed by their meaning (degrees
 * of freedom, a median of whole days, a t statistic).
 */
export type NumberFormat =
  | 'text' // written as text, never parsed as a formula or number
  | 'integer'
  | 'decimal1'
  | 'decimal2'
  | 'decimal3'
  | 'decimal4'
  | 'decimal6'
  | 'significant' // 4 significant digits, decimals chosen per value from its magnitude (formats.ts)
  | 'percent1'
  | 'pvalue' // 4 decimals, shown as "<0.0001" below that
  | 'date'; // a day number (0 = 1899-12-30), shown as yyyy-mm-dd

/** A cell in a table: text, a number, or empty. Text is always written as text. */
export type SheetCell = string | number | null;

export interface TableColumn {
  readonly header: string;
  readonly format: NumberFormat;
  /** Approximate width in characters; front ends may use it. */
  readonly width?: number;
}

export interface TableBlock {
  readonly kind: 'table';
  /** A short id unique within the sheet, letters/digits only, e.g. "ByVisit"; becomes the table name. */
  readonly id: string;
  readonly caption: string;
  readonly columns: readonly TableColumn[];
  readonly rows: readonly (readonly SheetCell[])[];
}

export interface ParagraphBlock {
  readonly kind: 'paragraph';
  readonly text: string;
  /** 'caution' paragraphs are shown emphasised. */
  readonly style?: 'normal' | 'caution' | 'heading';
  /** When given, the paragraph links to a cell of another sheet of the same run (front ends that cannot link show the text). */
  readonly link?: SheetLink;
}

/**
 * A link to a cell of another sheet of the same run, by the sheet's wanted name (SheetSpec.name); each front end turns
 * it into the name that sheet got (made legal and unique) and, in a workbook, an internal hyperlink such as
 * #'Summary'!A1 (ECMA-376 Part 1, §18.3.1.47, the hyperlink's location attribute).
 */
export interface SheetLink {
  readonly sheet: string;
  /** An A1-style cell address on that sheet, e.g. "A1". */
  readonly cell: string;
}

export interface ChartSeries {
  readonly name: string;
  readonly x: readonly (number | string)[];
  readonly y: readonly (number | null)[];
  /** Optional interval around y (same length). */
  readonly lower?: readonly (number | null)[];
  readonly upper?: readonly (number | null)[];
  /** 'line' joins points; 'points' draws markers only. */
  readonly style?: 'line' | 'points';
}

export interface ChartSpec {
  readonly kind: 'line' | 'bar' | 'scatter';
  readonly id: string;
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly series: readonly ChartSeries[];
  /** The table (by id, on the same sheet) that holds the charted numbers, for front ends that chart from cells. */
  readonly sourceTable?: string;
}

export interface ChartBlock {
  readonly kind: 'chart';
  readonly chart: ChartSpec;
}

export type Block = TableBlock | ParagraphBlock | ChartBlock;

export interface SheetSpec {
  /** The wanted sheet name (at most 24 characters, legal in Excel); front ends make it unique. */
  readonly name: string;
  readonly title: string;
  readonly blocks: readonly Block[];
}
