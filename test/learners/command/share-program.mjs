#!/usr/bin/env node
// A small program of the foldwise-command/1 protocol, for the tests (plain Node, no packages).
// It ignores the features and predicts like foldwise's baseline: for classification the
// training class shares as probabilities (columns in reverse class order, to check that the
// header is read by name), for regression the training mean. FOLDWISE_OPTION_MODE makes it
// misbehave on purpose; FOLDWISE_OPTION_INSPECT names a file it appends what it saw to.
import { appendFileSync, readFileSync, statSync, writeFileSync } from 'node:fs';

const [train, test, out] = process.argv.slice(-3);
const env = process.env;
const mode = env.FOLDWISE_OPTION_MODE ?? 'shares';
const job = JSON.parse(readFileSync(env.FOLDWISE_JOB, 'utf8'));

/** Minimal RFC 4180 reader: fields, quotes, doubled quotes, \n line ends. */
function parseCsv(text) {
  const rows = [];
  let row = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') (field += '"'), i++;
      else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') row.push(field), (field = '');
    else if (ch === '\n') row.push(field), rows.push(row), (row = []), (field = '');
    else field += ch;
  }
  if (field !== '' || row.length) row.push(field), rows.push(row);
  return rows;
}

const trainRows = parseCsv(readFileSync(train, 'utf8'));
const testRows = parseCsv(readFileSync(test, 'utf8'));
const n = trainRows.length - 1;
const m = testRows.length - 1;

if (env.FOLDWISE_OPTION_INSPECT) {
  const seen = {
    argv: process.argv.slice(2),
    cwd: process.cwd(),
    dirMode: (statSync(process.cwd()).mode & 0o777).toString(8),
    fold: env.FOLDWISE_FOLD,
    seed: env.FOLDWISE_SEED,
    task: env.FOLDWISE_TASK,
    target: env.FOLDWISE_TARGET,
    protocol: env.FOLDWISE_PROTOCOL,
    extra: env.FOLDWISE_OPTION_EXTRA_OPTION,
    inherited: env.SHARE_PROGRAM_INHERITED,
    job,
    trainHeader: trainRows[0],
    testHeader: testRows[0],
    trainFirst: trainRows[1],
    testFirst: testRows[1],
    trainEmpty: trainRows.slice(1).reduce((s, r) => s + r.filter((v) => v === '').length, 0),
    trainRows: n,
    testRows: m,
  };
  appendFileSync(env.FOLDWISE_OPTION_INSPECT, `${JSON.stringify(seen)}\n`);
}

if (mode === 'crash' || (mode.startsWith('fail-on=') && env.FOLDWISE_FOLD === mode.slice('fail-on='.length))) {
  process.stderr.write('loading the model\nfatal: the model exploded on purpose\n');
  process.exit(3);
}
if (mode === 'sleep') {
  setTimeout(() => {}, 60_000);
} else if (mode !== 'nofile') {
  const lines = [];
  if (job.task === 'regression') {
    let s = 0;
    for (let i = 1; i <= n; i++) s += Number(trainRows[i][trainRows[i].length - 1]);
    const mean = s / n;
    lines.push('prediction');
    for (let i = 0; i < m; i++) lines.push(mode === 'badnumber' && i === 1 ? 'abc' : String(mean));
  } else {
    const classes = job.classes;
    const counts = new Map(classes.map((c) => [c, 0]));
    for (let i = 1; i <= n; i++) {
      const c = trainRows[i][trainRows[i].length - 1];
      counts.set(c, counts.get(c) + 1);
    }
    if (mode === 'labels' || mode === 'badclass') {
      let best = classes[0];
      for (const c of classes) if (counts.get(c) > counts.get(best)) best = c;
      lines.push('label');
      for (let i = 0; i < m; i++) lines.push(mode === 'badclass' && i === 2 ? 'no such class' : best);
    } else {
      const order = [...classes].reverse();
      lines.push(order.join(','));
      for (let i = 0; i < m; i++) lines.push(order.map((c) => (mode === 'badsum' ? '0.5' : String(counts.get(c) / n))).join(','));
    }
  }
  if (mode === 'short') lines.pop();
  writeFileSync(out, `${lines.join('\n')}\n`);
}
