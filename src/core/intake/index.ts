/** The intake layer: cells in, typed columns and issues out. */
export type * from './types';
export { readTable } from './readTable';
export { GridSource, isCellSource, sourceGrid, toCellSource, type CellInput, type CellSource } from './cellSource';
export { detectMapping } from './detect';
export { renderMessage, roleWords, type MessageInput } from './messages';
export {
  columnLetters,
  columnIndex,
  parseCell,
  formatAddress,
  sheetNeedsQuotes,
  MAX_COLUMN_INDEX,
  MAX_ROW,
  type CellRef,
} from './cellAddress';
export {
  serialToDayNumber,
  isoToDayNumber,
  dayNumberToIso,
  daysFromCivil,
  civilFromDays,
  daysInMonth,
  OFFSET_1904,
  FIRST_DAY,
  LAST_DAY,
  type IsoDateResult,
} from './dates';
export { parseDateText, numericDateParts, type DateTextResult, type NumericDateParts } from './dateText';
export { decideDateOrder, type DateOrderDecision } from './dateOrder';
export { readDateColumn, dateCellIssue, unreadableColumn, DATE_PROBLEMS, type DateColumn, type DateProblemName } from './dateColumn';
export { readDateRole, type DateRoleRead } from './dateRole';
export { ACCEPTED_FORMS } from './messages';
export { ERROR_LITERALS, isBlankCell, isErrorCell, cellText, readTextCell, parsePlainDecimal } from './cellText';
export { IntakeUsageError } from './errors';
export { isArmHeader } from './armColumns';
export { offsetOfStudyDay, studyDayOfOffset } from './dayOffset';
export { CELL_TEXT_LIMIT, JSON_TEXT_CAP, capJsonText } from './longText';
export { duplicateHeaderGroups } from './duplicateHeaders';
export { decodeTable, type DecodedTable, type DecodedColumns, type DecodeResult } from './decodeTable';
export { checkTable } from './readTable';
export { decodeText, decodeNumbers, NUMBER_PROBLEMS, TEXT_OK, TEXT_BLANK, TEXT_ERROR, type CodedColumn, type NumberColumn } from './decodeColumns';
export { codesOfTexts, textCodesOf, textsOfCodes } from './textCodes';
