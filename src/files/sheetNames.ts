/** Legal, unique worksheet and table names: the shared rules live in src/core/report/sheetNames.ts. */
export { MAX_SHEET_NAME_LENGTH as MAX_SHEET_NAME, uniqueSheetNames, uniqueTableName } from '../core/report/sheetNames';
