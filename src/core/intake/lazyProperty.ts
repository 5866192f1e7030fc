/**
 * A property computed when first read: large per-row texts and listing rows are made only when something reads them
 * (a sheet, the JSON), not by the stages that work on codes and indices.
 */

/** Defines `key` on `target` as an enumerable property computed by `make` on first read, then kept as a plain value. */
export function lazyProperty(target: object, key: string, make: () => unknown): void {
  Object.defineProperty(target, key, {
    enumerable: true,
    configurable: true,
    get(): unknown {
      const value = make();
      Object.defineProperty(target, key, { value, enumerable: true, configurable: false, writable: false });
      return value;
    },
  });
}
