/** Recognises the bundled, invented demo trial (demo/egfr-visits.csv, or the same data saved as .xlsx). */
import type { DataSource } from '../taskpane/actions';

/** The demo's file name without extension (demo/README.md). */
const DEMO_STEM = 'egfr-visits';

/**
 * True when the loaded data came from the bundled demo file, judged by its file name: the source label is the file
 * name, followed by " (sheet …)" for a workbook. O(label length).
 * @example isDemoSource({ label: 'egfr-visits.csv', ... }) // true
 * @example isDemoSource({ label: 'visits.xlsx (sheet Visits)', ... }) // false
 */
export function isDemoSource(source: DataSource | null): boolean {
  if (source === null) return false;
  const fileName = source.label.replace(/ \(sheet [^)]*\)$/, '');
  return fileName.toLowerCase() === `${DEMO_STEM}.csv` || fileName.toLowerCase() === `${DEMO_STEM}.xlsx`;
}
