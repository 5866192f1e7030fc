/**
 * The repeated-measures stage (`settings.model === 'repeated'`): builds one row per participant and one column per
 * scheduled visit from the records classifyVisits matched to the schedule (on time, early or late; each slot's
 * record), fits the model with an unstructured covariance across visits (model/repeated), and hands the sheet and the
 * JSON section on. Unscheduled and repeat records are left out of this model and listed. In unblinded mode a
 * participant's arm is the arm of their first matched record; the first numeric covariate, when mapped, enters as
 * the baseline covariate with each participant's value at their first matched record. Visits without any value are
 * left out with a note. A design the engine refuses is no model: `note` says why. Cost O(participants · visits) plus
 * the fit.
 */
import type { IntakeTable } from "../intake/types";
import {
  DegenerateDataError,
  ModelInputError,
  RankDeficiencyError,
} from "../model";
import {
  fitRepeated,
  type RepeatedData,
  type RepeatedFit,
} from "../model/repeated";
import { repeatedJson, type LeftOutRecord } from "../report/repeatedJson";
import { repeatedSheet } from "../report/repeatedSheet";
import type { SheetSpec } from "../report/types";
import { STATUS_CODE } from "../schedule/types";
import type { VisitTiming } from "../schedule/types";
import { orderedArms } from "./modelData";
import type { AnalysisSettings } from "./types";

export interface RepeatedStage {
  readonly fit: RepeatedFit | null;
  readonly note: string | null;
  readonly notes: readonly string[];
  readonly leftOut: readonly LeftOutRecord[];
  readonly sheets: readonly SheetSpec[];
  readonly json: Record<string, unknown>;
}

export function repeatedStage(
  table: IntakeTable,
  timing: VisitTiming,
  settings: AnalysisSettings,
): RepeatedStage {
  const notes: string[] = [];
  const leftOut = leftOutRecords(table, timing);
  let fit: RepeatedFit | null = null;
  let note: string | null =
    table.mapping.value === undefined
      ? "no column is mapped to the value"
      : null;
  if (note === null) {
    try {
      const data = repeatedData(table, timing, settings, notes);
      fit = fitRepeated(data, {
        method: settings.method,
        dfMethod: settings.dfMethod,
        level: settings.level,
      });
      if (fit.status === "failed") {
        note = `the fit did not converge: ${fit.message}`;
        fit = null;
      }
    } catch (e) {
      if (!(
        e instanceof ModelInputError ||
        e instanceof RankDeficiencyError ||
        e instanceof DegenerateDataError
      ))
        throw e;
      note = e.message;
    }
  }
  const sheets = [
    repeatedSheet(fit, { mode: settings.mode, note, notes, leftOut }),
  ];
  return {
    fit,
    note,
    notes,
    leftOut,
    sheets,
    json: repeatedJson(fit, { note, notes, leftOut }),
  };
}

const MATCHED = new Set([
  STATUS_CODE.onTime,
  STATUS_CODE.early,
  STATUS_CODE.late,
]);

/** The participant × visit table of matched values (see the file comment). */
export function repeatedData(
  table: IntakeTable,
  timing: VisitTiming,
  settings: AnalysisSettings,
  notes: string[],
): RepeatedData {
  const V = timing.nVisits;
  const order = Array.from({ length: V }, (_, k) => k).sort(
    (a, b) => settings.schedule[a]!.targetDay - settings.schedule[b]!.targetDay,
  );
  const slot = (s: number, k: number): number => {
    const r = timing.slotRow[s * V + k]!;
    if (
      r < 0 ||
      !MATCHED.has(timing.slotStatus[s * V + k]!) ||
      table.usableModel[r] !== 1 ||
      !Number.isFinite(table.value[r]!)
    )
      return -1;
    return r;
  };
  const withValue = order.filter((k) => {
    for (let s = 0; s < timing.nSubjects; s++) if (slot(s, k) >= 0) return true;
    return false;
  });
  if (withValue.length < V) {
    const gone = order
      .filter((k) => !withValue.includes(k))
      .map((k) => `"${settings.schedule[k]!.label}"`);
    notes.push(
      `The visit-by-visit model leaves out ${gone.join(", ")}: no participant has a value matched to ${gone.length === 1 ? "that visit" : "those visits"}.`,
    );
  }
  const unblinded = settings.mode === "unblinded" && table.arm !== null;
  const base = table.covariates.find((c) => c.kind === "numeric");
  const skipped = table.covariates
    .filter((c) => c !== base)
    .map((c) => `"${c.name}"`);
  if (skipped.length > 0)
    notes.push(
      `The visit-by-visit model uses ${base === undefined ? "no covariate" : `"${base.name}" as the baseline covariate`}; ${skipped.join(", ")} ${skipped.length === 1 ? "is" : "are"} not used in it.`,
    );
  const first: number[] = [];
  const subjects: number[] = [];
  for (let s = 0; s < timing.nSubjects; s++) {
    const r = withValue.map((k) => slot(s, k)).find((x) => x >= 0);
    if (r === undefined) continue;
    subjects.push(s);
    first.push(r);
  }
  const present = unblinded
    ? table.arms.filter((a) => first.some((r) => table.arm![r] === a))
    : [];
  const arms = unblinded ? orderedArms(present, settings.referenceArm) : [];
  const armOf = new Map(arms.map((a, i) => [a, i]));
  if (base !== undefined && base.kind === "numeric") {
    const changes = subjects.some((sIdx, i) =>
      withValue.some((k) => {
        const r = slot(sIdx, k);
        return r >= 0 && base.values[r] !== base.values[first[i]!];
      }),
    );
    if (changes)
      notes.push(
        `"${base.name}" changes within participants; the visit-by-visit model uses each participant's value at their first matched visit.`,
      );
  }
  const W = withValue.length;
  const y = new Float64Array(subjects.length * W).fill(NaN);
  subjects.forEach((s, i) => {
    withValue.forEach((k, v) => {
      const r = slot(s, k);
      if (r >= 0) y[i * W + v] = table.value[r]!;
    });
  });
  return {
    visits: withValue.map((k) => settings.schedule[k]!.label),
    visitDays: withValue.map((k) => settings.schedule[k]!.targetDay),
    nSubjects: subjects.length,
    y,
    armIndex: unblinded
      ? Int32Array.from(first, (r) => armOf.get(table.arm![r]!) ?? 0)
      : null,
    arms,
    baseline:
      base === undefined || base.kind !== "numeric"
        ? null
        : {
            name: base.name,
            values: Float64Array.from(first, (r) => base.values[r]!),
          },
  };
}

/** Records of usable rows classified unscheduled or repeat: left out of this model. */
function leftOutRecords(
  table: IntakeTable,
  timing: VisitTiming,
): LeftOutRecord[] {
  const out: LeftOutRecord[] = [];
  for (let i = 0; i < table.nRows; i++) {
    const st = timing.rowStatus[i]!;
    if (st !== STATUS_CODE.extra && st !== STATUS_CODE.repeat) continue;
    out.push({
      row: table.sheetRows[i]!,
      participant: table.subject[i]!,
      status: st === STATUS_CODE.extra ? "extra" : "repeat",
    });
  }
  return out;
}

/** The JSON `model` section when the run reports the visit-by-visit model: its section plus `comparison`, one entry
 * per model fitted in the run ({kind, logLik, aic, bic, nParameters}; the random-intercept model when it was fitted). */
export function repeatedModelJson(
  stage: RepeatedStage,
  intercept: {
    readonly logLik: number;
    readonly aic: number;
    readonly bic: number;
    readonly nParameters: number;
  } | null,
): Record<string, unknown> {
  const n = (x: number): number | null => (Number.isFinite(x) ? x : null);
  const entry = (
    kind: string,
    f: {
      readonly logLik: number;
      readonly aic: number;
      readonly bic: number;
      readonly nParameters: number;
    },
  ): Record<string, unknown> => ({
    kind,
    logLik: n(f.logLik),
    aic: n(f.aic),
    bic: n(f.bic),
    nParameters: f.nParameters,
  });
  const comparison = [
    ...(intercept === null ? [] : [entry("intercept", intercept)]),
    ...(stage.fit === null ? [] : [entry("repeated", stage.fit)]),
  ];
  return { ...stage.json, comparison };
}
