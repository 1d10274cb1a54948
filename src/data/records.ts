/**
 * Re-reads the data rows of a CSV text as field arrays, with the same rules as the loader
 * (header first, blank lines skipped), and writes rows back as CSV. Used by `split`, which
 * copies rows into part files with their original text.
 */
import Papa from 'papaparse';

/** Calls `visit` with the header, then with each data row and its 0-based data row index. */
export function eachRecord(text: string, delimiter: string, visit: (fields: string[], row: number) => void): void {
  let header: string[] | null = null;
  let row = 0;
  Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), {
    delimiter,
    header: false,
    skipEmptyLines: false,
    step: (results) => {
      const fields = results.data;
      const blank = fields.length === 1 && fields[0] === '';
      if (header === null) {
        if (blank) return;
        header = fields;
        visit(fields, -1);
        return;
      }
      if (blank && header.length > 1) return;
      visit(fields, row++);
    },
  });
}

/** One CSV line (with a trailing newline), quoting only where needed. */
export function csvLine(fields: readonly string[], delimiter: string): string {
  return `${Papa.unparse([fields as string[]], { delimiter, newline: '\n', quotes: false, header: false })}\n`;
}
