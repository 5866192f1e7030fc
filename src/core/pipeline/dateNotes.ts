/** A plain sentence for the run's notes saying how a date column with numeric day and month was read. */
import { roleWords } from '../intake/messages';
import type { DateReading } from '../intake/types';

const ORDER_WORDS = { dmy: 'day/month/year', mdy: 'month/day/year' } as const;

/**
 * @example dateReadingNote({ role: 'date', column: 'ADT', order: 'dmy', source: 'data', evidence: ['13/01/2025'] })
 * // 'Dates in column "ADT" (visit date) with the day and month as numbers were read as day/month/year, the only reading of values such as "13/01/2025".'
 */
export function dateReadingNote(r: DateReading): string {
  const how =
    r.source === 'setting'
      ? 'as the date order setting says'
      : `the only reading of values such as ${r.evidence.map((e) => `"${e}"`).join(', ')}`;
  return `Dates in column "${r.column}" (${roleWords(r.role)}) with the day and month as numbers were read as ${ORDER_WORDS[r.order]}, ${how}.`;
}
