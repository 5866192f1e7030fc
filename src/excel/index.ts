/** The Office adapter: reads ranges in blocks, renders sheet specs, remembers settings. No statistics here. */
export { createExcelActions, scheduleMessage, STARTER_SHEET_NAME } from './actions';
export { rangeAddress, splitAddress, topLeftOf } from './address';
export { toCellValue } from './cellValue';
export { dateSystemFromProbe, probeDateSystem, queueDateProbe } from './dateSystem';
export { ExcelAdapterError, errorCode, errorText, explain } from './errors';
export { FORMAT_CODES, GENERAL_FORMAT, TEXT_FORMAT } from './formatCodes';
export { layoutSheet } from './layout';
export type { CellPatch, ChartPlan, SheetLayout, TablePlan } from './layout';
export { blockRows, isPayloadTooLarge, jsonBytes, readRange } from './readRange';
export type { ReadOptions, ReadResult, ReadTarget } from './readRange';
export { renderSheet } from './renderSheet';
export type { RenderOptions } from './renderSheet';
export { loadSavedSettings, parseSaved, saveSettings, SETTINGS_KEY } from './settings';
export { legalSheetName, MAX_SHEET_NAME_LENGTH, uniqueSheetName, uniqueTableName } from './sheetNames';
export { halvePatch, planWrites } from './writePlan';
export { MINIMUM_EXCEL_API, supportsExcelApi } from './features';
export { planWrapAreas, POINTS_PER_CHARACTER, textColumns } from './wrapAreas';
export type { WrapArea } from './wrapAreas';
