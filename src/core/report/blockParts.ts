/**
 * Small builders for the blocks of a sheet spec, shared by the report sheets (model, visit timing, analysis record) so
 * a column, a paragraph or a heading is written the same way everywhere. Internal to the report folder.
 */
import type { Block, NumberFormat, SheetCell, TableColumn } from './types';

/**
 * A table column; the width (in characters) only when given.
 * Example: col('Visit', 'text', 14) → {header: 'Visit', format: 'text', width: 14}; col('n', 'integer') → no width.
 */
export const col = (header: string, format: NumberFormat, width?: number): TableColumn =>
  width === undefined ? { header, format } : { header, format, width };

/** A paragraph with its style (default 'normal'). Example: para('Note') → {kind: 'paragraph', text: 'Note', style: 'normal'}. */
export const para = (text: string, style: 'normal' | 'caution' | 'heading' = 'normal'): Block => ({ kind: 'paragraph', text, style });

/** A heading paragraph. Example: heading('Settings') → {kind: 'paragraph', text: 'Settings', style: 'heading'}. */
export const heading = (text: string): Block => para(text, 'heading');

/** A number as a cell; non-finite numbers become empty cells. Example: cell(NaN) → null, cell(2.5) → 2.5. */
export const cell = (x: number): SheetCell => (Number.isFinite(x) ? x : null);

/** A confidence level as a percentage to one decimal. Example: levelPercent(0.95) → '95%', levelPercent(0.975) → '97.5%'. */
export const levelPercent = (level: number): string => `${Math.round(level * 1000) / 10}%`;
