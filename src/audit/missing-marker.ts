/**
 * Levels that look like missing-value markers ("." or "n/a" and the like, MISSING_MARKERS,
 * compared trimmed and lower-cased) in a categorical feature or target: read as a level, a
 * marker becomes a category of its own. Reported as a note with the row count. A rule of our
 * own; the list is what data files commonly use.
 */
import { DEFAULT_MISSING } from '../data/load-csv.js';
import type { Column } from '../data/types.js';
import { levelCounts } from './column-profile.js';
import type { Suspect } from './types.js';
import { count, q } from './wording.js';

export const MISSING_MARKERS: ReadonlySet<string> = new Set([
  '.', '-', '--', '---', '?', 'na', 'n/a', 'n.a.', 'nan', 'none', 'null', 'nil', 'missing', 'unknown', '#n/a', '(missing)', '(blank)',
  'not available', 'not known', 'blank', 'empty',
]);

export function missingMarkerSuspects(columns: readonly Column[]): Suspect[] {
  const out: Suspect[] = [];
  for (const col of columns) {
    if (col.kind !== 'categorical') continue;
    const counts = levelCounts(col.codes, col.levels.length);
    const found: { level: string; rows: number }[] = [];
    col.levels.forEach((level, k) => {
      if (counts[k] > 0 && MISSING_MARKERS.has(level.trim().toLowerCase())) found.push({ level, rows: counts[k] });
    });
    if (!found.length) continue;
    const rows = found.reduce((s, x) => s + x.rows, 0);
    out.push({
      kind: 'missing-marker',
      severity: 'note',
      columns: [col.name],
      reasons: found.map((x) => x.level),
      evidence: `${q(col.name)} has ${found.map((x) => `the level ${q(x.level)} in ${count(x.rows, 'row')}`).join(', ')}, which looks like a missing-value marker`,
      action: `if it means missing, add it to --missing (for example --missing ${q([...DEFAULT_MISSING.filter(Boolean), ...found.map((x) => x.level.trim())].join(','))}); read as a level it becomes a category of its own`,
      figures: { rows },
    });
  }
  return out;
}
