/**
 * `--threshold` inside one outer fold: the outer training rows are split into inner folds
 * (src/threshold/inner-folds.ts), the learner is fitted on each inner training part (with its
 * own fold-local preprocessing) and predicts the inner test part, and the rule
 * (src/threshold/rule.ts) picks the threshold on those out-of-fold probabilities of the positive
 * class. The outer test rows are never seen here: only `split.train` is read. Under a forward
 * (time-ordered) outer plan the inner split is time-ordered too (`innerForward`): each inner fit
 * uses earlier rows and predicts later ones, and the rule sees the predicted rows only (the
 * earliest block has no prediction).
 *
 * Seeds: the inner split's generator from (seed, "threshold-split", repeat, fold), the same for
 * every learner of the fold; each inner fit's from (seed, "threshold-fit", spec, repeat, fold,
 * inner fold). Both depend only on the run seed and the plan position, so a task gives the same
 * threshold in this thread, in a worker, in a shard or after a resume.
 */
import type { Problem } from '../data/problem.js';
import type { Fold } from '../plans/types.js';
import { createRng, deriveSeed } from '../rng.js';
import { innerFolds, innerForward, partsOf } from '../threshold/inner-folds.js';
import { chooseThreshold, type ThresholdRule } from '../threshold/rule.js';
import { foldLabel } from '../model/fold-label.js';
import type { FoldView, Learner, Matrix, Params } from '../learning.js';

/** What --threshold asks of every fold task. */
export interface ThresholdPlan {
  readonly rule: ThresholdRule;
  /** the rule as given, for the report */
  readonly text: string;
  readonly innerFolds: number;
  /** the outer plan is in time order (forward): the inner split is cut in time order too, by problem.order */
  readonly timeOrdered: boolean;
}

export interface InnerThreshold {
  /** +Infinity when the rule calls nothing positive */
  readonly value: number;
  readonly met: boolean;
}

/** Makes the preprocessed matrices of an inner split (tasks.ts SplitData), passed in so that this file does not import tasks.ts. */
export type SplitMaker = (train: Int32Array, test: Int32Array) => {
  matrix(part: 'train' | 'test', scale: boolean): Matrix;
  view(label: string, scale: boolean): FoldView;
};

/** The learner of a task (tasks.ts Candidate). */
export interface InnerCandidate {
  readonly learner: Learner;
  readonly spec: string;
  readonly params: Params;
}

/**
 * The threshold of one outer fold for one learner, or undefined when the learner gives no
 * probabilities or the inner predictions hold only one class (the rule needs both).
 */
export function innerThreshold(
  problem: Problem,
  seed: number,
  c: InnerCandidate,
  f: Fold,
  train: Int32Array,
  plan: ThresholdPlan,
  makeSplit: SplitMaker,
): InnerThreshold | undefined {
  const y = problem.target;
  if (y.task !== 'classification') return undefined;
  const classOf = Int32Array.from(train, (u) => y.codes[u]);
  const groupOf = problem.groups ? Int32Array.from(train, (u) => problem.groups![u]) : undefined;
  const k = plan.innerFolds;
  const rng = createRng(deriveSeed(seed, 'threshold-split', f.repeat, f.fold));
  const parts = plan.timeOrdered
    ? innerForward(Float64Array.from(train, (u) => problem.order![u]), k, rng, groupOf)
    : partsOf(innerFolds(classOf, y.classes.length, k, rng, groupOf), k);
  const score = new Float64Array(train.length);
  const predicted = new Uint8Array(train.length);
  // positions in `train` of each inner part's rows (ascending, so problem rows stay ascending)
  for (const [q, part] of parts.entries()) {
    const testRows = Int32Array.from(part.test, (i) => train[i]);
    const trainRows = Int32Array.from(part.train, (i) => train[i]);
    const split = makeSplit(trainRows, testRows);
    const fitSeed = deriveSeed(seed, 'threshold-fit', c.spec, f.repeat, f.fold, q);
    const scale = c.learner.needsScaling;
    const target = { task: 'classification' as const, codes: Int32Array.from(trainRows, (u) => y.codes[u]), classes: y.classes };
    const model = c.learner.fit(split.matrix('train', scale), target, c.params, {
      rng: createRng(fitSeed),
      seed: fitSeed,
      fold: split.view(`${foldLabel(f)}.t${q + 1}`, scale),
    });
    const probs = model.probabilities?.(split.matrix('test', scale));
    if (!probs) return undefined;
    for (let j = 0; j < part.test.length; j++) {
      score[part.test[j]] = probs[j * 2 + 1];
      predicted[part.test[j]] = 1;
    }
  }
  // the rule reads the predicted rows only, in their order in `train`
  const at: number[] = [];
  for (let i = 0; i < train.length; i++) if (predicted[i]) at.push(i);
  const scores = Float64Array.from(at, (i) => score[i]);
  const outcome = Uint8Array.from(at, (i) => (classOf[i] === 1 ? 1 : 0));
  let pos = 0;
  for (const o of outcome) pos += o;
  if (pos === 0 || pos === outcome.length) return undefined;
  const chosen = chooseThreshold(scores, outcome, plan.rule);
  return { value: chosen.threshold, met: chosen.met };
}
