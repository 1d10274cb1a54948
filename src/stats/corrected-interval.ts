/**
 * The corrected resampled t interval of Nadeau & Bengio (2003), shared by `summarize` and
 * `correctedT`.
 *
 * Fold scores from resampling are not independent: training sets overlap, so the plain
 * variance of their mean, s^2 / J, is too small. Nadeau & Bengio replace the factor 1/J by
 * (1/J + n_test/n_train), where J is the number of scores, n_test the rows each model is
 * tested on and n_train the rows it is trained on. In words: the interval is
 *
 *   mean +/- t_{J-1, (1+level)/2} * sqrt((1/J + testRows/trainRows) * s^2)
 *
 * with s^2 the sample variance (denominator J-1) of the J scores. For r repeats of k-fold,
 * J = k * r and the degrees of freedom stay J - 1 (Bouckaert & Frank 2004).
 *
 * Sources: C. Nadeau and Y. Bengio, "Inference for the Generalization Error", Machine Learning
 * 52:239-281, 2003 (free: the NIPS 1999 version, Advances in Neural Information Processing
 * Systems 12, pp. 307-313, https://proceedings.neurips.cc/paper_files/paper/1999/file/
 * 7d12b66d3df6af8d429c1a357d8b9e1a-Paper.pdf); R. R. Bouckaert and E. Frank, "Evaluating the
 * Replicability of Significance Tests for Comparing Learning Algorithms", PAKDD 2004, LNCS 3056,
 * pp. 3-12 (free: University of Waikato Research Commons,
 * https://researchcommons.waikato.ac.nz/handle/10289/1451).
 */
import { UsageError } from '../errors.js';
import { tQuantile } from './t-quantile.js';

/** Mean rows per test set and per training set of the resampling plan that produced the scores. */
export interface ResampleCorrection {
  readonly testRows: number;
  readonly trainRows: number;
}

/** Throws UsageError "<fn>: correction.<field> must be a finite number > 0, got <v>". */
export function checkCorrection(fn: string, correction: ResampleCorrection): void {
  if (correction == null || typeof correction !== 'object') {
    throw new UsageError(`${fn}: correction must be an object { testRows, trainRows }`);
  }
  for (const field of ['testRows', 'trainRows'] as const) {
    const v = correction[field];
    if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
      throw new UsageError(`${fn}: correction.${field} must be a finite number > 0, got ${v}`);
    }
  }
}

/** Throws UsageError "<fn>: level must be a number strictly between 0 and 1, got <v>". */
export function checkLevel(fn: string, level: number): void {
  if (typeof level !== 'number' || !(level > 0 && level < 1)) {
    throw new UsageError(`${fn}: level must be a number strictly between 0 and 1, got ${level}`);
  }
}

/** The Nadeau-Bengio variance factor 1/J + testRows/trainRows (the plain t interval has 1/J). */
export function correctedVarianceFactor(j: number, correction: ResampleCorrection): number {
  return 1 / j + correction.testRows / correction.trainRows;
}

/**
 * The corrected interval mean +/- t_{J-1,(1+level)/2} sqrt(factor * s^2), for J >= 2 scores
 * with sample variance `sampleVariance`. Arguments are assumed checked by the caller. The
 * callers never pass a zero variance: they floor it or refuse (see variance-floor.ts).
 */
export function correctedInterval(
  mean: number,
  sampleVariance: number,
  j: number,
  correction: ResampleCorrection,
  level: number,
): [number, number] {
  const half = tQuantile((1 + level) / 2, j - 1) * Math.sqrt(correctedVarianceFactor(j, correction) * sampleVariance);
  return [mean - half, mean + half];
}
