/**
 * Benchmark runner: `node dist/bench/run.js [NAME ...] [--runs N] [--list]`.
 * NAME selects cases by full name (forest-vs-ref) or first word (forest); none runs all.
 * To add cases, write bench/cases/NAME.ts exporting `cases: BenchCase[]` and add ONE line below.
 */
import type { BenchCase, BenchTable } from './case.js';

const CASES: readonly BenchCase[] = [
  ...(await import('./cases/forest.js')).cases,
  ...(await import('./cases/boost.js')).cases,
  ...(await import('./cases/logistic.js')).cases,
  ...(await import('./cases/knn.js')).cases,
  ...(await import('./cases/eval.js')).cases,
  ...(await import('./cases/honesty.js')).cases,
  ...(await import('./cases/honesty-power.js')).cases,
  ...(await import('./cases/tune.js')).cases,
  ...(await import('./cases/scale.js')).cases,
  ...(await import('./cases/audit.js')).cases,
  ...(await import('./cases/audit-scale.js')).cases,
  ...(await import('./cases/honesty-slices.js')).cases,
];

function selected(names: readonly string[]): BenchCase[] {
  if (names.length === 0) return [...CASES];
  const out: BenchCase[] = [];
  for (const name of names) {
    const hits = CASES.filter((c) => c.name === name || c.name.split('-')[0] === name);
    if (hits.length === 0) {
      throw new Error(`bench: no case named "${name}"; cases: ${CASES.map((c) => c.name).join(', ')}`);
    }
    for (const h of hits) if (!out.includes(h)) out.push(h);
  }
  return out;
}

function render(t: BenchTable): string {
  const cells = [t.columns.map(String), ...t.rows.map((r) => r.map(String))];
  const widths = t.columns.map((_, j) => Math.max(...cells.map((r) => (r[j] ?? '').length)));
  const line = (r: readonly string[]) => `| ${r.map((c, j) => c.padEnd(widths[j])).join(' | ')} |`;
  const out = [`## ${t.title}`, '', line(cells[0]), `|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`];
  for (const r of cells.slice(1)) out.push(line(r));
  if (t.notes?.length) out.push('', ...t.notes);
  return out.join('\n');
}

async function main(argv: readonly string[]): Promise<void> {
  const names: string[] = [];
  let runs = 5;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--list') {
      for (const c of CASES) console.log(`${c.name.padEnd(20)} ${c.doc}`);
      return;
    }
    if (a === '--runs') {
      runs = Number(argv[++i]);
      if (!Number.isInteger(runs) || runs < 1) throw new Error('bench: --runs needs an integer >= 1');
    } else names.push(a);
  }
  const log = (line: string) => console.error(`  ${line}`);
  console.log(`node ${process.version}, ${process.platform}/${process.arch}`);
  for (const c of selected(names)) {
    console.error(`[${c.name}] ${c.doc}`);
    const tables = await c.run({ runs, log });
    for (const t of tables) console.log(`\n${render(t)}`);
  }
}

main(process.argv.slice(2)).catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exitCode = 1;
});
