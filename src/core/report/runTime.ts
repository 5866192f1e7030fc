/**
 * The run time: kept in the results JSON as an ISO 8601 timestamp with the local UTC offset
 * ("2026-12-02T14:05:09+01:00", ISO 8601-1:2019 §5.3.4.2 extended format), shown to people as a readable local
 * date-time with that offset ("2026-12-02 14:05 (UTC+01:00)"). Core has no clock and no time zone: the front end
 * passes the moment and its local offset.
 */

/** "+01:00", "-05:30", "+00:00" for an offset east of UTC in minutes. */
function offsetText(minutes: number): string {
  const sign = minutes < 0 ? '-' : '+';
  const a = Math.abs(minutes);
  return `${sign}${String(Math.floor(a / 60)).padStart(2, '0')}:${String(a % 60).padStart(2, '0')}`;
}

/**
 * The ISO 8601 local timestamp of a moment (milliseconds since 1970-01-01T00:00Z) at an offset east of UTC in whole
 * minutes (JavaScript gives it as −Date#getTimezoneOffset()), to the second. Throws RangeError on a non-finite moment
 * or an offset beyond ±18 hours (ISO 8601 allows up to ±23:59; no zone in use reaches 15 hours; ±18 h is the range
 * java.time and others accept, common practice). O(1).
 * Example: isoWithOffset(Date.UTC(2026, 11, 2, 13, 5, 9), 60) → "2026-12-02T14:05:09+01:00";
 * isoWithOffset(Date.UTC(2026, 11, 2, 3, 0), -300) → "2026-12-01T22:00:00-05:00".
 */
export function isoWithOffset(epochMs: number, offsetMinutes: number): string {
  if (!Number.isFinite(epochMs)) throw new RangeError(`isoWithOffset: the moment must be a finite number of milliseconds (got ${epochMs})`);
  if (!Number.isInteger(offsetMinutes) || Math.abs(offsetMinutes) > 18 * 60) {
    throw new RangeError(`isoWithOffset: the offset must be whole minutes within ±18 hours (got ${offsetMinutes})`);
  }
  const local = new Date(Math.floor(epochMs / 1000) * 1000 + offsetMinutes * 60_000).toISOString(); // "YYYY-MM-DDTHH:MM:SS.000Z"
  return `${local.slice(0, 19)}${offsetText(offsetMinutes)}`;
}

const ISO_LOCAL = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2})(?::\d{2}(?:\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/**
 * An ISO 8601 timestamp as people read it: the date and time as written (local to the offset) and the offset
 * ("Z" is UTC+00:00). Text that is not such a timestamp is returned unchanged, so a hand-made value still shows. O(1).
 * Examples: readableRunTime("2026-12-02T14:05:09+01:00") → "2026-12-02 14:05 (UTC+01:00)";
 * readableRunTime("2026-12-02T13:05:09.123Z") → "2026-12-02 13:05 (UTC+00:00)"; readableRunTime("today") → "today".
 */
export function readableRunTime(iso: string): string {
  const m = ISO_LOCAL.exec(iso.trim());
  if (m === null) return iso;
  const zone = m[3]!;
  const offset = zone === 'Z' ? '+00:00' : zone.includes(':') ? zone : `${zone.slice(0, 3)}:${zone.slice(3)}`;
  return `${m[1]!} ${m[2]!} (UTC${offset})`;
}
