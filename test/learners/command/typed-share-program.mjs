#!/usr/bin/env node
// A foldwise-command/1 program for the tests that reads format=arrow or format=parquet files
// with the formats' own readers (apache-arrow, hyparquet) and predicts like foldwise's
// baseline: the training class shares (classification) or the training mean (regression).
// It refuses to run when job.json's format and the files' names disagree.
import { readFileSync, writeFileSync } from 'node:fs';
import { tableFromIPC } from 'apache-arrow';
import { parquetReadObjects } from 'hyparquet';

const [train, test, out] = process.argv.slice(-3);
const job = JSON.parse(readFileSync(process.env.FOLDWISE_JOB, 'utf8'));
if (!train.endsWith(`.${job.format}`) || !test.endsWith(`.${job.format}`)) {
  process.stderr.write(`format ${job.format} but files ${train} ${test}\n`);
  process.exit(3);
}

async function columnOf(path, name) {
  if (job.format === 'arrow') {
    const t = tableFromIPC(readFileSync(path));
    return { rows: t.numRows, values: t.getChild(name) ? [...t.getChild(name)] : [] };
  }
  const buf = readFileSync(path);
  const rows = await parquetReadObjects({ file: buf.buffer.slice(buf.byteOffset, buf.byteOffset + buf.length) });
  return { rows: rows.length, values: rows.map((r) => r[name]) };
}

const y = (await columnOf(train, job.target)).values;
const m = (await columnOf(test, job.target)).rows;
if (y.length !== job.trainRows || m !== job.testRows) {
  process.stderr.write(`rows ${y.length}/${m}, job says ${job.trainRows}/${job.testRows}\n`);
  process.exit(4);
}
let text;
if (job.task === 'classification') {
  const counts = job.classes.map((c) => y.filter((v) => v === c).length);
  const line = counts.map((k) => String(k / y.length)).join(',');
  text = `${job.classes.join(',')}\n${`${line}\n`.repeat(m)}`;
} else {
  const mean = y.reduce((s, v) => s + Number(v), 0) / y.length;
  text = `value\n${`${mean}\n`.repeat(m)}`;
}
writeFileSync(out, text);
