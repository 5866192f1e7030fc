/** The machine-readable record of a run its data stopped: enough for a script to say why (schema in the README). */
import type { Issue } from '../intake/types';
import { CAUTIONS } from '../report/cautions';
import { issueJson } from './resultsJson';
import { compactIssues } from './compactIssues';
import { capJsonText } from '../intake/longText';
import type { AnalysisSettings } from './types';

/**
 * `{ ok: false, tool, cautions, input: { label, sheet, topLeft, rows }, settings: { mode, dateOrder }, issues }`, the
 * stopping problems (errors) listed before the warnings. O(issues).
/**
 * `rows` is the number of data rows (the header row not counted).
 * @example stopJson(cells.length - 1, settings, issues).ok // false
 */
export function stopJson(rows: number, settings: AnalysisSettings, issues: readonly Issue[]): Record<string, unknown> {
  const ordered = [...issues.filter((i) => i.severity === 'error'), ...issues.filter((i) => i.severity !== 'error')];
  return capJsonText({
    ok: false,
    tool: { name: 'longipane', version: settings.toolVersion ?? 'unknown' },
    cautions: [...CAUTIONS],
    input: { label: settings.inputLabel, sheet: settings.sheet, topLeft: settings.topLeft, rows: Math.max(0, rows) },
    settings: { mode: settings.mode, dateOrder: settings.dateOrder ?? null, runAt: settings.runAt },
    issues: compactIssues(ordered).map(issueJson),
  });
}
