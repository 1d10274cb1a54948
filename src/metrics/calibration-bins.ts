/**
 * Equal-count bins of (score, outcome) pairs, the binning behind `ece` and the reliability
 * curve. Rows are sorted by score; bin b of B nominally holds the sorted positions
 * floor(b n / B) .. floor((b + 1) n / B) - 1, so bin sizes differ by at most one. Rows with the
 * same score are never split: a boundary falling inside a run of tied scores moves to the end
 * of the run, so the bins (and every figure computed from them) do not depend on row order.
 * A bin emptied by such a move is dropped, so fewer than B bins may come back.
 *
 * Each bin gives its row count, the mean score ("confidence") and the share of outcomes that
 * are 1 ("observed frequency"), plus the lowest and highest score in it.
 *
 * Source: the equal-frequency binning of Naeini, Cooper & Hauskrecht (2015), "Obtaining well
 * calibrated probabilities using Bayesian binning", Proc. AAAI 2015, 2901-2907 (free author
 * copy).
 */

export interface CalibrationBin {
  readonly count: number;
  /** mean score of the rows in the bin */
  readonly meanScore: number;
  /** share of the bin's rows whose outcome is 1 */
  readonly observed: number;
  /** number of rows with outcome 1 */
  readonly hits: number;
  readonly lowScore: number;
  readonly highScore: number;
}

/** Equal-count bins of `score` (any finite numbers) against `outcome` (0 or 1); see the file comment. */
export function equalCountBins(score: Float64Array, outcome: Uint8Array, bins: number): CalibrationBin[] {
  const n = score.length;
  if (outcome.length !== n) throw new RangeError(`equalCountBins: score and outcome lengths differ (${n} and ${outcome.length})`);
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`equalCountBins: bins must be a positive integer (got ${bins})`);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  order.sort((a, b) => score[a] - score[b] || a - b);
  const out: CalibrationBin[] = [];
  let start = 0;
  for (let b = 0; b < bins && start < n; b++) {
    let end = b === bins - 1 ? n : Math.floor(((b + 1) * n) / bins);
    if (end <= start) continue;
    // keep ties together: extend to the end of the run of the last score
    while (end < n && score[order[end]] === score[order[end - 1]]) end++;
    let sum = 0;
    let hits = 0;
    for (let j = start; j < end; j++) {
      sum += score[order[j]];
      hits += outcome[order[j]];
    }
    const count = end - start;
    out.push({ count, meanScore: sum / count, observed: hits / count, hits, lowScore: score[order[start]], highScore: score[order[end - 1]] });
    start = end;
  }
  return out;
}

/**
 * The score and 0/1 outcome whose calibration `ece` measures. Two classes: the probability of
 * class 1 against "actual = 1" (the form of Naeini et al. 2015). More classes: the top-label
 * form, the largest probability of each row against "predicted class is right", where the
 * predicted class is the first column holding that largest probability (Guo, Pleiss, Sun &
 * Weinberger 2017, "On calibration of modern neural networks", Proc. ICML, free on arXiv).
 */
export function calibrationPairs(actual: Int32Array, proba: Float64Array, classes: number): { score: Float64Array; outcome: Uint8Array } {
  const n = actual.length;
  const score = new Float64Array(n);
  const outcome = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    if (classes === 2) {
      score[i] = proba[2 * i + 1];
      outcome[i] = actual[i] === 1 ? 1 : 0;
      continue;
    }
    let best = 0;
    for (let k = 1; k < classes; k++) if (proba[i * classes + k] > proba[i * classes + best]) best = k;
    score[i] = proba[i * classes + best];
    outcome[i] = actual[i] === best ? 1 : 0;
  }
  return { score, outcome };
}
