/** Types of the visit schedule and of the visit-timing result (SPEC §4). */

/** One scheduled visit: label, target study day, and the days allowed before and after it (bounds included). */
export interface ScheduleVisit {
  readonly label: string;
  readonly targetDay: number;
  readonly before: number;
  readonly after: number;
}

/** Status words; JSON uses these keys, sheets show the plain words of STATUS_WORDS. */
export type VisitStatus = 'onTime' | 'early' | 'late' | 'missed' | 'notYetDue' | 'extra' | 'repeat';

export const STATUS_WORDS: Readonly<Record<VisitStatus, string>> = {
  onTime: 'On time',
  early: 'Early',
  late: 'Late',
  missed: 'Missed',
  notYetDue: 'Not yet due',
  extra: 'Extra',
  repeat: 'Repeat',
};

export type StatusCounts = Readonly<Record<VisitStatus, number>>;
