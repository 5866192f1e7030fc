/** Glue between the run and the report layer's model and record builders. */
import type { IntakeTable, Issue } from '../intake/types';
import type { ModelFit } from '../model/types';
import { timingJson } from '../report/timingJson';
import type { TimingSummary } from '../report/timingTypes';
import type { SheetSpec } from '../report/types';
import type { ObservedMean } from './modelData';
import type { AnalysisSettings, ExcludedRow } from './types';

export { timingJson };

export interface ModelPartsInput {
  readonly fit: ModelFit | null;
  readonly means: readonly ObservedMean[];
  readonly settings: AnalysisSettings;
  readonly table: IntakeTable;
  readonly nRows: number;
  readonly modelNote: string | null;
}

// TODO(pipeline): replace with the report layer's modelSheets/modelJson when they land.
export function modelOutputs(_input: ModelPartsInput): { sheets: SheetSpec[]; json: Record<string, unknown> | null } {
  return { sheets: [], json: null };
}

export interface RecordInput {
  readonly settings: AnalysisSettings;
  readonly table: IntakeTable;
  readonly issues: readonly Issue[];
  readonly excluded: readonly ExcludedRow[];
  readonly fingerprint: string;
  readonly summary: TimingSummary;
  readonly fit: ModelFit | null;
  readonly modelNote: string | null;
  readonly notes: readonly string[];
}

// TODO(pipeline): replace with the report layer's analysis record sheet when it lands.
export function recordSheet(input: RecordInput): SheetSpec {
  return { name: 'Analysis record', title: 'Analysis record', blocks: [{ kind: 'paragraph', text: `Input: ${input.settings.inputLabel}` }] };
}
