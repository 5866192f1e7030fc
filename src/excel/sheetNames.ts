/** Legal, unique worksheet and table names: the shared rules live in src/core/report/sheetNames.ts. */
export { legalSheetName, MAX_SHEET_NAME_LENGTH, uniqueSheetName, uniqueTableName } from '../core/report/sheetNames';
