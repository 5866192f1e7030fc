export { FileFormatError } from './errors';
export { readCsvText } from './readCsv';
export { readXlsxBuffer } from './readXlsx';
export type { XlsxSheet } from './readXlsx';
export { writeWorkbook, CHART_NOTE } from './writeWorkbook';
export { uniqueSheetNames, uniqueTableName, MAX_SHEET_NAME } from './sheetNames';
export { decodeCsvBytes } from './decodeText';
