/**
 * Misuse of the intake functions (an impossible column index, a malformed address passed by a caller) throws this
 * error. Problems in the user's data never throw: they become issues (see types.ts).
 * The message format is fixed: "<function>: <what was wrong> (got <value>)".
 */
export class IntakeUsageError extends Error {
  override readonly name = 'IntakeUsageError';

  constructor(fn: string, problem: string, got: unknown) {
    super(`${fn}: ${problem} (got ${describe(got)})`);
  }
}

function describe(got: unknown): string {
  if (typeof got === 'string') return JSON.stringify(got);
  return String(got);
}
