/**
 * Small synthetic CSVs for the hostile-input cases and the fuzz run. The generating process is
 * fixed and known (no real-world data): row i has a = (i * 37 mod 101) / 10, b cycles through
 * u, v, w, d is a date one day per row from 2024-01-01, z = 2a + (i mod 3) and the class y is
 * "p" when a + (i mod 3) > 5, else "q" (so a and b carry signal and both classes are common).
 */
export interface Frame {
  readonly header: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

function day(i: number): string {
  return new Date(Date.UTC(2024, 0, 1 + i)).toISOString().slice(0, 10);
}

/** The base frame: columns a, b, d, z, y and `n` rows. */
export function baseFrame(n = 30): Frame {
  const rows = Array.from({ length: n }, (_, i) => {
    const a = ((i * 37) % 101) / 10;
    return [String(a), ['u', 'v', 'w'][i % 3], day(i), String(2 * a + (i % 3)), a + (i % 3) > 5 ? 'p' : 'q'];
  });
  return { header: ['a', 'b', 'd', 'z', 'y'], rows };
}

/** A three-column frame a, b, y, for the cases that change one cell or name. */
export function smallFrame(n = 30): Frame {
  const f = baseFrame(n);
  return { header: ['a', 'b', 'y'], rows: f.rows.map((r) => [r[0], r[1], r[4]]) };
}

/** CSV text with a delimiter and line ending; fields with the delimiter, a quote or a line break are quoted. */
export function csvText(frame: Frame, delimiter = ',', eol = '\n'): string {
  const field = (t: string): string => (t.includes(delimiter) || /["\r\n]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t);
  const line = (cells: readonly string[]): string => cells.map(field).join(delimiter);
  return [line(frame.header), ...frame.rows.map(line)].join(eol) + eol;
}

/** A copy of the frame with cell (row, column) replaced. */
export function withCell(frame: Frame, row: number, col: number, text: string): Frame {
  return { header: frame.header, rows: frame.rows.map((r, i) => (i === row ? r.map((c, j) => (j === col ? text : c)) : r)) };
}
