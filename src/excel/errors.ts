/** Errors the Office adapter raises. Each carries a message the task pane shows as it is. */

/** Thrown when the workbook or the host refuses an operation; the message says what was being done and why it failed. */
export class ExcelAdapterError extends Error {
  constructor(message: string, options?: { readonly cause?: unknown }) {
    super(message, options);
    this.name = 'ExcelAdapterError';
  }
}

/** The host's error code (OfficeExtension.Error.code), or "" when the error carries none. */
export function errorCode(error: unknown): string {
  if (typeof error === 'object' && error !== null && 'code' in error) {
    const code = (error as { code: unknown }).code;
    if (typeof code === 'string') return code;
  }
  return '';
}

/** The error's own message, or its text. */
export function errorText(error: unknown): string {
  if (error instanceof Error) return error.message;
  return String(error);
}

/**
 * Wraps any failure of `work` in an ExcelAdapterError whose message starts with `doing`, e.g.
 * "Reading the selection failed: The selection has more than one area." The original error is kept as `cause`.
 */
export async function explain<T>(doing: string, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof ExcelAdapterError) throw error;
    const code = errorCode(error);
    throw new ExcelAdapterError(`${doing} failed: ${errorText(error)}${code !== '' ? ` (${code})` : ''}`, { cause: error });
  }
}
