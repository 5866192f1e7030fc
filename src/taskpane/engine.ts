/** The two core functions the pane calls, gathered so tests can hand the pane a stand-in. */
import type { CellValue, DetectedMapping, Mode } from '../core/intake/types';
import type { AnalysisOutput, AnalysisSettings, RunHooks } from '../core/pipeline/types';
import { detectMapping } from '../core/intake';
import { runAnalysis } from '../core/pipeline/runAnalysis';

export interface PaneEngine {
  readonly detectMapping: (headers: readonly string[], mode: Mode) => DetectedMapping;
  readonly runAnalysis: (
    cells: readonly (readonly CellValue[])[],
    settings: AnalysisSettings,
    hooks: RunHooks,
  ) => Promise<AnalysisOutput>;
}

export const CORE_ENGINE: PaneEngine = { detectMapping, runAnalysis };
