/** Misuse of the pipeline (settings no front end should send): "runAnalysis: <what> (<got>)". */
export class PipelineUsageError extends Error {
  override readonly name = 'PipelineUsageError';
  constructor(what: string, got: string) {
    super(`runAnalysis: ${what} (${got}).`);
  }
}
