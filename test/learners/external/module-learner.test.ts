/**
 * module: learners: the example module in examples/external runs through the learner checks and
 * a whole evaluation on the Palmer penguins (vega-datasets, CC0); faulty modules fail with
 * messages naming the module and the problem.
 */
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../../src/data/load-csv.js';
import { UsageError } from '../../../src/errors.js';
import { formatSpec, getLearner, loadExternalLearners, parseLearnerSpec, resolveParams } from '../../../src/learners/index.js';
import type { Matrix, Target } from '../../../src/learning.js';
import { createRng } from '../../../src/rng.js';
import { evaluate } from '../../../src/run/evaluate.js';
import { penguinsCsv } from '../../helpers/penguins.js';
import { tempFolder } from '../../helpers/tmp.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
const EXAMPLE = 'module:./examples/external/centroid-learner.mjs';
const ctx = { rng: createRng(1), seed: 1 };
const mat = (rows: number[][]): Matrix => ({ rows: rows.length, cols: rows[0].length, data: Float64Array.from(rows.flat()) });

describe('module: learners', () => {
  it('parses module and command specs with options after ";" and keeps built-in specs as they were', () => {
    expect(parseLearnerSpec('module:./a/b.js;k=3,mode=x')).toEqual({ text: 'module:./a/b.js;k=3,mode=x', name: 'module:./a/b.js', options: [['k', '3'], ['mode', 'x']] });
    expect(parseLearnerSpec('module:/abs/c:d.mjs').name).toBe('module:/abs/c:d.mjs');
    expect(parseLearnerSpec('command:rtrain;timeout=5').name).toBe('command:rtrain');
    expect(() => parseLearnerSpec('module:learner.js')).toThrow(/explicit path starting with \.\/, \.\.\/ or \//);
    expect(() => parseLearnerSpec('module:some-package')).toThrow(UsageError);
    expect(() => parseLearnerSpec('command:My Prog')).toThrow(/command:NAME with a lower-case NAME/);
    expect(() => parseLearnerSpec('module:./x.js;')).toThrow(/nothing after ";"/);
    expect(() => parseLearnerSpec('module:./x.js;k')).toThrow(/"k" is not key=value/);
    // a second ";" is refused, not read into the value (`pids=X;k=1|2` was the value `X;k=1|2`)
    expect(() => parseLearnerSpec('command:rtrain;pids=X;k=1|2')).toThrow('--learner "command:rtrain;pids=X;k=1|2": a second ";" at ";k=1|2"; the options after the first ";" are separated by ",": command:rtrain;a=1,b=2');
    expect(() => getLearner('module:./not-loaded.js')).toThrow(/the module is not loaded/);
    expect(() => getLearner('command:nope')).toThrow(/no program is given for it; add --command nope=PROGRAM/);
  });

  it('loads the example module, checks options, formats specs with ";"', async () => {
    await loadExternalLearners([EXAMPLE, 'knn'], ROOT);
    const l = getLearner(EXAMPLE);
    expect(l.tasks).toEqual(['classification', 'regression']);
    expect(l.needsScaling).toBe(true);
    const p = resolveParams(l, parseLearnerSpec(`${EXAMPLE};temperature=0.5`), 'classification');
    expect(formatSpec(l, p)).toBe(`${EXAMPLE};temperature=0.5`);
    expect(formatSpec(l, resolveParams(l, parseLearnerSpec(EXAMPLE), 'regression'))).toBe(EXAMPLE);
    expect(() => resolveParams(l, parseLearnerSpec(`${EXAMPLE};temperature=0`), 'classification')).toThrow(`--learner ${EXAMPLE}: temperature=0: must be greater than 0`);
    expect(() => resolveParams(l, parseLearnerSpec(`${EXAMPLE};temp=1`), 'classification')).toThrow(/unknown option "temp"/);
  });

  it('the example module predicts hand-checkable centroids, round-trips and is deterministic', async () => {
    await loadExternalLearners([EXAMPLE], ROOT);
    const l = getLearner(EXAMPLE);
    // centroids: class a at (0, 0), class b at (4, 0); class c absent
    const X = mat([[-1, 0], [1, 0], [3, 0], [5, 0]]);
    const y: Target = { task: 'classification', codes: Int32Array.from([0, 0, 1, 1]), classes: ['a', 'b', 'c'] };
    const m = l.fit(X, y, { temperature: 1 }, ctx);
    const Q = mat([[1, 0], [3.5, 1]]);
    expect(Array.from(m.predict(Q))).toEqual([0, 1]);
    const p = m.probabilities!(Q);
    expect(p.length).toBe(6);
    // query (1, 0): distances^2 1 and 9, so P(a) = e^-1 / (e^-1 + e^-9)
    expect(Math.abs(p[0] - Math.exp(-1) / (Math.exp(-1) + Math.exp(-9)))).toBeLessThan(1e-12);
    expect(p[2]).toBe(0);
    const back = l.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.probabilities!(Q))).toEqual(Array.from(p));
    expect(Array.from(l.fit(X, y, { temperature: 1 }, ctx).predict(Q))).toEqual([0, 1]);
  });

  it('runs a whole evaluation beside the built-ins (penguins)', async () => {
    await loadExternalLearners([EXAMPLE], ROOT);
    const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
    const report = evaluate(table, { target: 'Species', learners: [EXAMPLE, 'logistic'], plan: 'kfold:5', timing: false });
    expect(report.learners.map((x) => x.spec)).toEqual(['baseline', EXAMPLE, 'logistic']);
    const acc = report.learners.map((x) => x.summary.accuracy!.mean);
    expect(acc[1]).toBeGreaterThan(acc[0]); // beats the majority class
  });

  it('rejects faulty modules with messages naming the module and the problem', async () => {
    const t = tempFolder();
    const write = (name: string, body: string) => (t.file(name, body), `module:${resolve(t.dir, name)}`);
    const noFit = write('nofit.mjs', 'export default { tasks: ["regression"] };');
    await expect(loadExternalLearners([noFit], '/')).rejects.toThrow(/has no fit function/);
    const badTask = write('badtask.mjs', 'export default { tasks: ["ranking"], fit() {} };');
    await expect(loadExternalLearners([badTask], '/')).rejects.toThrow(/"tasks" must be a non-empty array/);
    const badParam = write('badparam.mjs', 'export default { tasks: ["regression"], params: [{ name: "k", kind: "int", min: 1, default: 0 }], fit() {} };');
    await expect(loadExternalLearners([badParam], '/')).rejects.toThrow(/params\[0\]: default 0 is outside its limits/);
    await expect(loadExternalLearners(['module:./missing.mjs'], t.dir)).rejects.toThrow(/cannot read/);
    const syntax = write('syntax.mjs', 'export default {');
    await expect(loadExternalLearners([syntax], '/')).rejects.toThrow(/importing .* failed/);

    const faulty = write(
      'faulty.mjs',
      `export default { tasks: ["classification", "regression"], params: [{ name: "mode", kind: "choice", choices: ["short", "code", "probs", "promise"], default: "short" }],
        fit(X, y, p) {
          if (p.mode === "promise") return Promise.resolve({});
          return { predict: (Q) => p.mode === "short" ? [0] : Array.from({ length: Q.rows }, () => 7),
                   probabilities: (Q) => new Float64Array(Q.rows * 2).fill(0.7) };
        } };`,
    );
    await loadExternalLearners([faulty], '/');
    const l = getLearner(faulty);
    const X = mat([[1], [2]]);
    const y: Target = { task: 'classification', codes: Int32Array.from([0, 1]), classes: ['a', 'b'] };
    expect(() => l.fit(X, y, { mode: 'short' }, ctx).predict(X)).toThrow(`${faulty}: predict returned 1 values for 2 rows`);
    expect(() => l.fit(X, y, { mode: 'code' }, ctx).predict(X)).toThrow(`${faulty}: predict row 1: 7 is not a class code 0..1`);
    expect(() => l.fit(X, y, { mode: 'code' }, ctx).probabilities!(X)).toThrow(`${faulty}: probabilities row 1 sums to 1.4, not 1`);
    expect(() => l.fit(X, y, { mode: 'promise' }, ctx)).toThrow(/fit returned a Promise; fit must be synchronous/);
    expect(() => l.load({ learner: faulty, model: null })).toThrow(/exports no load\(json\) function/);
  });

  it('refuses a model whose probabilities come from the method name of foldwise 0.1, naming probabilities(X)', async () => {
    const t = tempFolder();
    // the method name foldwise 0.1 called, spelled in two parts
    const old = 'predict' + 'Proba';
    const path = resolve(t.dir, 'old-method.mjs');
    t.file('old-method.mjs', `export default { tasks: ["classification"], fit() { return { predict: (Q) => new Int32Array(Q.rows), ${old}: (Q) => new Float64Array(Q.rows * 2).fill(0.5) }; } };`);
    const name = `module:${path}`;
    await loadExternalLearners([name], '/');
    const X = mat([[1], [2]]);
    const y: Target = { task: 'classification', codes: Int32Array.from([0, 1]), classes: ['a', 'b'] };
    expect(() => getLearner(name).fit(X, y, {}, ctx)).toThrow(`${name}: the model has ${old}(X) but no probabilities(X); foldwise reads class probabilities from probabilities(X): rename the method`);
  });
});
