import { windowOffsets } from './studyDay';
import type { CellValue } from '../intake/types';
import { cellAddress, parseCell } from './address';
import { labelKey } from './labels';
import type { ParseScheduleResult, ScheduleIssue, ScheduleVisit } from './types';

type Field = 'label' | 'targetDay' | 'before' | 'after';

/** Accepted headings per field, compared ignoring case, spaces, underscores and hyphens. */
const HEADINGS: Readonly<Record<Field, readonly string[]>> = {
  label: ['visit', 'visitname', 'visitlabel', 'name', 'label'],
  targetDay: ['targetday', 'targetstudyday', 'target'],
  before: ['daysbefore', 'daysallowedbefore', 'before'],
  after: ['daysafter', 'daysallowedafter', 'after'],
};

const FIELD_WORDS: Readonly<Record<Field, string>> = {
  label: 'visit name',
  targetDay: 'target day',
  before: 'days allowed before',
  after: 'days allowed after',
};

/**
 * Largest |target day| and largest allowance accepted: 36,500 days, 100 years either side of the reference date — far
 * beyond any trial, and small enough that every window's dates stay ordinary calendar dates.
 */
export const MAX_SCHEDULE_DAYS = 36_500;
const DAYS_TEXT = '36,500';

const headingKey = (v: CellValue): string => (typeof v === 'string' ? v.replace(/[\s_-]+/g, '').toLowerCase() : '');

const shown = (v: CellValue): string => (v === null || v === undefined ? '' : String(v));

/** A whole number from a number cell or numeric text ("85", " 7 "); NaN for blanks, text and fractions stay as-is. */
function toNumber(v: CellValue): number {
  if (typeof v === 'number') return v;
  if (typeof v === 'string' && /^\s*[+-]?\d+(\.\d+)?\s*$/.test(v)) return Number(v);
  return NaN;
}

/**
 * Reads a visit schedule from a cell grid whose first row holds the headings, e.g. the CSV header
 * `visit,target_day,days_before,days_after` or the starter sheet's "Visit name | Target day | Days allowed before |
 * Days allowed after" (case-insensitive; columns in any order; other columns ignored). Blank rows are skipped.
 * Checks, each reported with its cell address: a label is present and unique (ignoring case and spaces); the target
 * day is a whole number other than 0 (CDISC study days have no day 0) with |day| ≤ 36,500; allowances are whole
 * numbers from 0 to 36,500; no two visits share a target day (an error); windows that share days are a warning. Numbers may be numbers or numeric text. Cost O(rows · log rows) for the sort.
 * Example: [["visit","target_day","days_before","days_after"],["Week 12",85,7,7]] on sheet "Schedule" at "A1" →
 * {ok: true, schedule: [{label: "Week 12", targetDay: 85, before: 7, after: 7}], issues: []}.
 */
export function parseSchedule(cells: readonly (readonly CellValue[])[], sheet: string, topLeft: string): ParseScheduleResult {
  const issues: ScheduleIssue[] = [];
  const headerRow = parseCell(topLeft).row;
  const at = (col: number, rowOffset: number): string => cellAddress(sheet, topLeft, col, headerRow + rowOffset);
  const header = cells[0];
  if (header === undefined || cells.length < 2) {
    issues.push(tableIssue('schedule-empty', 'The schedule needs a heading row and at least one visit row.', null));
    return { ok: false, schedule: [], issues };
  }
  const cols: Partial<Record<Field, number>> = {};
  header.forEach((h, c) => {
    const k = headingKey(h);
    for (const f of Object.keys(HEADINGS) as Field[]) {
      if (cols[f] === undefined && HEADINGS[f].includes(k)) cols[f] = c;
    }
  });
  for (const f of Object.keys(HEADINGS) as Field[]) {
    if (cols[f] === undefined) {
      issues.push(
        tableIssue(
          'schedule-missing-column',
          `The schedule has no "${FIELD_WORDS[f]}" column (accepted headings: ${HEADINGS[f].join(', ')}).`,
          at(0, 0),
        ),
      );
    }
  }
  if (issues.length > 0) return { ok: false, schedule: [], issues };
  const c = cols as Record<Field, number>;

  const visits: { visit: ScheduleVisit; rowOffset: number }[] = [];
  const seen = new Map<string, string>();
  for (let r = 1; r < cells.length; r++) {
    const row = cells[r] ?? [];
    const cell = (f: Field): CellValue => row[c[f]];
    if ((Object.keys(c) as Field[]).every((f) => shown(cell(f)).trim() === '')) continue;
    let good = true;
    const label = shown(cell('label')).trim();
    if (label === '') {
      issues.push(rowIssue('schedule-blank-label', at(c.label, r), '', 'The visit name is blank.'));
      good = false;
    } else {
      const first = seen.get(labelKey(label));
      if (first !== undefined) {
        issues.push(
          rowIssue('schedule-duplicate-label', at(c.label, r), label, `The visit name "${label}" repeats the name at ${first} (names are compared ignoring case and spaces).`),
        );
        good = false;
      } else seen.set(labelKey(label), at(c.label, r));
    }
    const target = toNumber(cell('targetDay'));
    if (!Number.isInteger(target)) {
      issues.push(rowIssue('schedule-bad-target-day', at(c.targetDay, r), shown(cell('targetDay')), 'The target day must be a whole number.'));
      good = false;
    } else if (target === 0) {
      issues.push(rowIssue('schedule-zero-target-day', at(c.targetDay, r), '0', 'There is no study day 0: the reference date is day 1 and the day before it is day -1.'));
      good = false;
    } else if (Math.abs(target) > MAX_SCHEDULE_DAYS) {
      issues.push(
        rowIssue('schedule-bad-target-day', at(c.targetDay, r), shown(cell('targetDay')), `The target day must lie between -${DAYS_TEXT} and ${DAYS_TEXT} (100 years either side of the reference date).`),
      );
      good = false;
    }
    const allowance = (f: 'before' | 'after'): number => {
      const v = toNumber(cell(f));
      if (Number.isInteger(v) && v >= 0 && v <= MAX_SCHEDULE_DAYS) return v;
      issues.push(rowIssue('schedule-bad-allowance', at(c[f], r), shown(cell(f)), `The ${FIELD_WORDS[f]} must be a whole number of days from 0 to ${DAYS_TEXT}.`));
      good = false;
      return NaN;
    };
    const before = allowance('before');
    const after = allowance('after');
    if (good) visits.push({ visit: { label, targetDay: target, before, after }, rowOffset: r });
  }
  if (visits.length === 0 && issues.length === 0) {
    issues.push(tableIssue('schedule-empty', 'The schedule has headings but no visit rows.', at(0, 0)));
  }
  visits.sort((a, b) => a.visit.targetDay - b.visit.targetDay || a.rowOffset - b.rowOffset);
  // Two visits on one target day have the same window position: matching by day cannot tell them apart, and one of
  // them would always count as missed. An error at the later row, naming the earlier one.
  for (let k = 1; k < visits.length; k++) {
    const p = visits[k - 1]!;
    const q = visits[k]!;
    if (p.visit.targetDay === q.visit.targetDay) {
      const later = p.rowOffset < q.rowOffset ? q : p;
      const earlier = later === q ? p : q;
      const cellAt = at(c.targetDay, later.rowOffset);
      issues.push(
        rowIssue(
          'schedule-duplicate-target-day',
          cellAt,
          String(later.visit.targetDay),
          `The visits "${earlier.visit.label}" (${at(c.targetDay, earlier.rowOffset)}) and "${later.visit.label}" have the same target day ${later.visit.targetDay}; give each visit its own day, or merge them into one visit.`,
        ),
      );
    }
  }
  let widest = visits[0]; // among the visits so far, the one whose window closes last
  for (let k = 1; k < visits.length; k++) {
    const p = widest!;
    const q = visits[k]!;
    // Compared in calendar offsets (windowOffsets), as windows are applied, so a window crossing day 1 is not off by one.
    if (windowOffsets(q.visit).closes > windowOffsets(p.visit).closes) widest = q;
    if (p.visit.targetDay !== q.visit.targetDay && windowOffsets(p.visit).closes >= windowOffsets(q.visit).opens) {
      issues.push({
        code: 'schedule-overlap',
        severity: 'warning',
        cell: at(c.targetDay, q.rowOffset),
        row: headerRow + q.rowOffset,
        value: q.visit.label,
        use: null,
        message: `The windows of "${p.visit.label}" and "${q.visit.label}" share days; a record in the shared days is matched to one visit only.`,
      });
    }
  }
  const ok = !issues.some((i) => i.severity === 'error');
  return { ok, schedule: visits.map((v) => v.visit), issues };

  function rowIssue(code: ScheduleIssue['code'], cell: string, value: string, message: string): ScheduleIssue {
    return { code, severity: 'error', cell, row: Number(/(\d+)$/.exec(cell)?.[1]), value, use: null, message };
  }
}

function tableIssue(code: ScheduleIssue['code'], message: string, cell: string | null): ScheduleIssue {
  return { code, severity: 'error', cell, row: null, value: '', use: null, message };
}
