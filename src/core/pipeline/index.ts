/** The pipeline: one analysis run from cells to sheet specs and JSON, shared by the add-in, the page and the CLI. */
export * from './types';
export { runAnalysis } from './runAnalysis';
export { excludedRows } from './excludedRows';
export { compactIssues, type CompactIssue } from './compactIssues';
export { rowsLeftOut } from '../report/rowsLeftOut';
export { PipelineUsageError } from './errors';
export { fitStage } from './fitStage';
export type { FitStage } from './fitStage';
export { contrastDays, modelRows, observedMeans, orderedArms } from './modelData';
export type { ObservedMean } from './modelData';
export { resultsJson, mappingByHeader, issueJson } from './resultsJson';
export { stopJson } from './stopJson';
export { dateReadingNote } from './dateNotes';
