export { FileFormatError } from './errors';
export { readCsvText } from './readCsv';
export { readXlsxBuffer } from './readXlsx';
export { XLSX_LIMITS, SHEET_ROWS, SHEET_COLUMNS } from './readXlsx';
export type { XlsxSheet, XlsxLimits } from './readXlsx';
export { writeWorkbook, CHART_NOTE } from './writeWorkbook';
export { uniqueSheetNames, uniqueTableName, MAX_SHEET_NAME } from './sheetNames';
export { decodeCsvBytes } from './decodeText';
