/** The visit schedule, study days and window statuses (SPEC §4). */
export * from './types';
export { cellAddress, columnLetters, parseCell } from './address';
export { labelKey } from './labels';
export { dayNumberFromIso, isoDate } from './dates';
export { StudyDayError, dateForStudyDay, studyDay, windowDates, windowOffsets, windowStudyDays, type WindowOffsets } from './studyDay';
export { computeStudyDays } from './computeStudyDays';
export type { DataPlace } from './computeStudyDays';
export { parseSchedule } from './parseSchedule';
export { CSV_HEADINGS, STARTER_HEADINGS, STARTER_SCHEDULE, starterScheduleCells } from './starter';
export { ClassifyError, classifyVisits } from './classify';
export type { ClassifyOptions } from './classify';
