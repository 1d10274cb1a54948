/**
 * Operating points of a score against a 0/1 outcome, one point per distinct score: every row
 * scoring at least t is called positive. Rows tied at a score enter together, so a run of tied
 * scores makes one diagonal step of the ROC curve rather than a staircase whose shape would
 * depend on row order (Fawcett 2006, Algorithm 2 and section 5).
 *
 * Source: Fawcett (2006), "An introduction to ROC analysis", Pattern Recognition Letters
 * 27:861-874 (free author copy).
 */

/** Cumulative counts at each distinct score, highest first; index 0 is the empty set (threshold +Infinity). */
export interface OperatingPoints {
  readonly positives: number;
  readonly negatives: number;
  /** threshold of each point: rows with score >= threshold are called positive */
  readonly threshold: Float64Array;
  readonly tp: Float64Array;
  readonly fp: Float64Array;
}

export function operatingPoints(score: Float64Array, outcome: Uint8Array): OperatingPoints {
  const n = score.length;
  const order = new Int32Array(n);
  let positives = 0;
  for (let i = 0; i < n; i++) {
    order[i] = i;
    positives += outcome[i];
  }
  order.sort((a, b) => score[b] - score[a]);
  const threshold: number[] = [Infinity];
  const tp: number[] = [0];
  const fp: number[] = [0];
  let t = 0;
  let f = 0;
  let i = 0;
  while (i < n) {
    const s = score[order[i]];
    while (i < n && score[order[i]] === s) {
      if (outcome[order[i]] === 1) t++;
      else f++;
      i++;
    }
    threshold.push(s);
    tp.push(t);
    fp.push(f);
  }
  return { positives, negatives: n - positives, threshold: Float64Array.from(threshold), tp: Float64Array.from(tp), fp: Float64Array.from(fp) };
}

/** Area under the ROC points by the trapezoid rule (ties count one half, as the Mann-Whitney form); NaN without both kinds of rows. */
export function rocArea(p: OperatingPoints): number {
  if (p.positives === 0 || p.negatives === 0) return NaN;
  let area = 0;
  for (let j = 1; j < p.tp.length; j++) area += ((p.fp[j] - p.fp[j - 1]) * (p.tp[j] + p.tp[j - 1])) / 2;
  return area / (p.positives * p.negatives);
}

/** Step-wise average precision of the points: sum of (recall step) x (precision at the step); NaN without positives. */
export function stepwiseArea(p: OperatingPoints): number {
  if (p.positives === 0) return NaN;
  let area = 0;
  for (let j = 1; j < p.tp.length; j++) area += ((p.tp[j] - p.tp[j - 1]) / p.positives) * (p.tp[j] / (p.tp[j] + p.fp[j]));
  return area;
}

/**
 * The points of precision-recall space between two operating points a and b (a fewer true
 * positives than b), as Davis & Goadrich (2006, section 4) interpolate them: each extra true
 * positive brings (FP_b - FP_a) / (TP_b - TP_a) false positives, so for x = 0 .. TP_b - TP_a
 *
 *   recall = (TP_a + x) / P,  precision = (TP_a + x) / (TP_a + x + FP_a + skew * x)
 *
 * which is a curve, not the straight line between the two PR points. Returns those points,
 * both ends included.
 *
 * Source: Davis & Goadrich (2006), "The relationship between precision-recall and ROC curves",
 * Proc. ICML 2006, 233-240 (free author copy).
 */
export function prInterpolate(
  a: { readonly tp: number; readonly fp: number },
  b: { readonly tp: number; readonly fp: number },
  positives: number,
): { recall: number[]; precision: number[] } {
  const steps = b.tp - a.tp;
  if (!(steps > 0) || !Number.isInteger(steps)) throw new RangeError(`prInterpolate: b must have more true positives than a, by a whole number (got ${a.tp} and ${b.tp})`);
  const skew = (b.fp - a.fp) / steps;
  const recall: number[] = [];
  const precision: number[] = [];
  for (let x = 0; x <= steps; x++) {
    const tp = a.tp + x;
    recall.push(tp / positives);
    precision.push(tp / (tp + a.fp + skew * x));
  }
  return { recall, precision };
}
