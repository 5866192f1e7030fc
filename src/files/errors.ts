/** The one error type the file adapters throw: the file cannot be read or written at all (misuse or a broken file).
 * Problems inside a readable table are not errors here; intake reports them as issues with cell addresses. */
export class FileFormatError extends Error {
  override readonly name = 'FileFormatError';
  constructor(message: string) {
    super(message);
  }
}
