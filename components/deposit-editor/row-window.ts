/** Tables longer than this show a window of rows; every row is still kept and saved. */
export const LARGE_TABLE_ROWS = 500;
/** Rows shown at a time in a large table. */
export const ROW_WINDOW = 200;

/** The rows on screen: all of a small table; of a large one, ROW_WINDOW rows from `start` (clamped). */
export function visibleRows(total: number, start: number): { from: number; to: number; windowed: boolean } {
  if (total <= LARGE_TABLE_ROWS) return { from: 0, to: total, windowed: false };
  const from = Math.max(0, Math.min(Math.floor(start), total - ROW_WINDOW));
  return { from, to: Math.min(total, from + ROW_WINDOW), windowed: true };
}

/** The window start that shows zero-based row `row` (the window begins at a multiple of ROW_WINDOW). */
export function windowStartFor(row: number): number {
  return Math.max(0, Math.floor(row / ROW_WINDOW) * ROW_WINDOW);
}
