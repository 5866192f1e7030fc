/** One line of bench/latest.json. */
export interface BenchEntry {
  readonly name: string;
  readonly rows: number;
  readonly seconds: number;
  readonly baselineSeconds: number;
  readonly ratio: number;
  readonly peakMB: number;
}
