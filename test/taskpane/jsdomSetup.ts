/** jsdom lacks ResizeObserver, which Fluent's message bar uses to reflow; a do-nothing stand-in is enough for tests. */
class NoResizeObserver {
  observe(): void {}
  unobserve(): void {}
  disconnect(): void {}
}
if (!('ResizeObserver' in globalThis)) {
  Object.defineProperty(globalThis, 'ResizeObserver', { value: NoResizeObserver, configurable: true, writable: true });
}
