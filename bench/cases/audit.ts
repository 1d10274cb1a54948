/**
 * `npm run bench -- audit`: the audit's false-alarm and detection table on the whole
 * calibration corpus (bench/audit-corpus.ts), as given in the README ("False alarms"). The
 * figures are counts, not timings: the same on every machine.
 */
import type { BenchCase } from '../case.js';
import { auditCorpus, runEntry, tabulate, type EntryResult } from '../audit-corpus.js';

export const cases: BenchCase[] = [
  {
    name: 'audit-corpus',
    doc: 'audit false alarms on clean data and detection of planted problems (issue #20)',
    async run({ log }) {
      const entries = auditCorpus('full');
      const results: EntryResult[] = [];
      for (const e of entries) results.push(await runEntry(e));
      log(`${entries.length} data sets audited (quick audit as eval prints it, and the full audit), plans as listed in bench/audit-corpus.ts, seed 1`);
      const t = tabulate(results);
      return [
        {
          title: `Audit on the calibration corpus: ${t.cleanQuiet} of ${t.cleanSets} clean sets print nothing before eval (${((100 * t.cleanQuiet) / t.cleanSets).toFixed(1)}%; goal 97%)`,
          columns: t.header,
          rows: t.rows,
          notes: [
            'clean rows: share of clean sets with a finding of that kind (printed before eval; in the full audit at high, warn or higher, any severity).',
            'planted rows: share of the sets with that planted problem where its finding is printed, and found at high, warn or higher, any severity.',
            ...(t.alarms.length ? ['clean sets with a printed finding:', ...t.alarms.map((a) => `- ${a.slice(0, 240)}`)] : []),
            ...(t.misses.length ? ['planted problems not found at the expected severity:', ...t.misses.map((m) => `- ${m}`)] : []),
          ],
        },
      ];
    },
  },
];
