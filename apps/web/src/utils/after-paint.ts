/**
 * Resolves once the browser has painted the next frame: for work a screen can do just after it first shows (settings
 * it reads, connections it opens), so that work does not hold back or compete with that first paint on a slow phone.
 */
export function afterNextPaint(): Promise<void> {
  return new Promise((resolve) => requestAnimationFrame(() => setTimeout(resolve)));
}
