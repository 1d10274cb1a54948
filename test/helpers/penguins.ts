/**
 * The Palmer penguins data shipped in the npm package vega-datasets (CC0; Gorman, Williams &
 * Fraser 2014, PLoS ONE 9(3):e90081), read straight from node_modules (the package's own loader
 * downloads from the web, and its exports map hides data/) and written as a CSV so it goes
 * through our loader. Missing values (JSON null) become empty cells; the one "." in the Sex
 * column stays as it is.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';

export const PENGUINS_JSON = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'node_modules', 'vega-datasets', 'data', 'penguins.json');

export function penguinsCsv(): string {
  const rows = JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, string | number | null>[];
  const header = Object.keys(rows[0]);
  const data = rows.map((r) => header.map((h) => (r[h] === null ? '' : String(r[h]))));
  return `${Papa.unparse([header, ...data], { newline: '\n' })}\n`;
}
