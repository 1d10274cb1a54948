/**
 * Re-reads the data rows of a CSV text as field arrays with the loader's own scanner (the same
 * rows, fields and line ends), and writes rows back as CSV. Used by `split`, which
 * copies rows into part files with their original text.
 */
import Papa from 'papaparse';
import { CsvScanner, type ScanSink } from './csv-scan.js';

/** Calls `visit` with the header, then with each data row and its 0-based data row index. */
export function eachRecord(text: string, delimiter: string, visit: (fields: string[], row: number) => void): void {
  let fields: string[] = [];
  let row = 0;
  const sink: ScanSink = {
    header: (names) => visit(names, -1),
    cell: (j, buf, s, e) => {
      fields[j] = Buffer.from(buf.buffer, buf.byteOffset + s, e - s).toString('utf8');
    },
    row: () => {
      visit(fields, row++);
      fields = [];
    },
  };
  const scanner = new CsvScanner(delimiter.charCodeAt(0), sink, 'data');
  scanner.push(Buffer.from(text, 'utf8'));
  scanner.end();
}

/** One CSV line (with a trailing newline), quoting only where needed. */
export function csvLine(fields: readonly string[], delimiter: string): string {
  return `${Papa.unparse([fields as string[]], { delimiter, newline: '\n', quotes: false, header: false })}\n`;
}
