/** Results → sheet specs and JSON: plain tables, formats, chart specs, the visit-timing reports and the analysis record. */
export * from './types';
export { CAUTIONS, INVENTED_DATA_NOTE, UNBLINDED_CAUTION } from './cautions';
export { EXCEL_FORMAT_CODES, formatCell } from './formats';
export { Sha256, sha256Hex } from './sha256';
export { CellFingerprint, fingerprintCells, serialiseCell } from './fingerprint';
export type { FingerprintCell } from './fingerprint';
export * from './timingTypes';
export { summarizeTiming } from './summarizeTiming';
export { summarizeByVisit } from './visitSummary';
export { summarizeBySite } from './siteSummary';
export { listDeviations } from './deviationList';
export { listVisitsDue } from './visitsDue';
export { NO_ARM, NO_SITE, armGroups, siteGroups } from './groups';
export { ON_TIME_RATE_NOTE, TIMING_SHEET_NAMES, cutoffPhrase, timingSheets, timingSummaryText } from './timingSheets';
export { timingJson } from './timingJson';
export type { JsonDay, VisitJson, VisitsJson } from './timingJson';
export { analysisRecordSheet, mappingLines } from './record';
export type { AnalysisRecordInput, MappingLine, RecordExclusion } from './record';
