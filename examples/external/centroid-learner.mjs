// A complete module learner for foldwise: nearest class centroid (classification) and a
// shrunken mean (regression), to show the interface. Use it with
//   foldwise eval data.csv --target y --learner module:./examples/external/centroid-learner.mjs
//   ... --learner 'module:./examples/external/centroid-learner.mjs;temperature=0.5'
// X is { rows, cols, data: Float64Array } (row-major, after foldwise's fold-local preprocessing);
// y is { task: 'classification', codes: Int32Array, classes: string[] } or
//      { task: 'regression', values: Float64Array }.

function centroidModel(state) {
  const { cols, centroids, temperature, task, mean } = state;
  const dist2 = (X, i, c) => {
    let s = 0;
    for (let j = 0; j < cols; j++) s += (X.data[i * cols + j] - centroids[c * cols + j]) ** 2;
    return s;
  };
  const K = task === 'classification' ? centroids.length / cols : 0;
  return {
    predict(X) {
      if (task === 'regression') return new Float64Array(X.rows).fill(mean);
      const out = new Int32Array(X.rows);
      for (let i = 0; i < X.rows; i++) {
        let best = 0;
        for (let c = 1; c < K; c++) if (dist2(X, i, c) < dist2(X, i, best)) best = c;
        out[i] = best;
      }
      return out;
    },
    // softmax of -distance^2 / temperature: nearer centroids get more probability
    ...(task === 'classification'
      ? {
          probabilities(X) {
            const out = new Float64Array(X.rows * K);
            for (let i = 0; i < X.rows; i++) {
              const s = Array.from({ length: K }, (_, c) => -dist2(X, i, c) / temperature);
              const m = Math.max(...s);
              const e = s.map((v) => Math.exp(v - m));
              const t = e.reduce((a, b) => a + b, 0);
              e.forEach((v, c) => (out[i * K + c] = v / t));
            }
            return out;
          },
        }
      : {}),
    toJSON: () => ({ ...state, centroids: Array.from(centroids) }),
  };
}

export default {
  tasks: ['classification', 'regression'],
  params: [
    { name: 'temperature', kind: 'number', min: 0, minExclusive: true, max: 1000, default: 1, simpler: 'higher', doc: 'softness of the class probabilities' },
  ],
  needsScaling: true,
  doc: 'nearest class centroid (example module learner)',
  fit(X, y, params) {
    const cols = X.cols;
    if (y.task === 'regression') {
      const mean = y.values.reduce((a, b) => a + b, 0) / y.values.length;
      return centroidModel({ task: 'regression', cols, centroids: new Float64Array(0), temperature: params.temperature, mean });
    }
    const K = y.classes.length;
    const sums = new Float64Array(K * cols);
    const counts = new Float64Array(K);
    for (let i = 0; i < X.rows; i++) {
      const c = y.codes[i];
      counts[c]++;
      for (let j = 0; j < cols; j++) sums[c * cols + j] += X.data[i * cols + j];
    }
    // a class absent from the training rows gets a centroid at infinity (never nearest)
    const centroids = sums.map((s, t) => (counts[Math.floor(t / cols)] > 0 ? s / counts[Math.floor(t / cols)] : Infinity));
    return centroidModel({ task: 'classification', cols, centroids, temperature: params.temperature, mean: 0 });
  },
  load(json) {
    return centroidModel({ ...json, centroids: Float64Array.from(json.centroids, (v) => (v === null ? Infinity : v)) });
  },
};
