import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { confusionMatrix, defaultMetrics, getMetric, METRIC_NAMES, METRICS } from '../../src/metrics/index.js';

describe('metric registry', () => {
  it('lists exactly the seventeen names, each registered under its own name', () => {
    expect([...METRIC_NAMES]).toEqual([
      'accuracy',
      'balanced-accuracy',
      'macro-precision',
      'macro-recall',
      'macro-f1',
      'mcc',
      'kappa',
      'log-loss',
      'brier',
      'roc-auc',
      'average-precision',
      'ece',
      'cost',
      'mae',
      'rmse',
      'r2',
      'medae',
    ]);
    expect(METRICS.size).toBe(METRIC_NAMES.length);
    for (const name of METRIC_NAMES) {
      const m = METRICS.get(name);
      expect(m?.name).toBe(name);
      expect(m?.doc.length).toBeGreaterThan(0);
      expect(m?.doc.includes('\n')).toBe(false);
    }
  });

  it('records direction and probability needs', () => {
    const lower = METRIC_NAMES.filter((n) => !getMetric(n).higherIsBetter);
    expect(lower).toEqual(['log-loss', 'brier', 'ece', 'cost', 'mae', 'rmse', 'medae']);
    const probs = METRIC_NAMES.filter((n) => getMetric(n).needsProba);
    expect(probs).toEqual(['log-loss', 'brier', 'roc-auc', 'average-precision', 'ece']);
    const regression = METRIC_NAMES.filter((n) => getMetric(n).task === 'regression');
    expect(regression).toEqual(['mae', 'rmse', 'r2', 'medae']);
  });

  it('defaults per task', () => {
    expect(defaultMetrics('classification')).toEqual(['accuracy', 'balanced-accuracy', 'macro-f1', 'log-loss']);
    expect(defaultMetrics('regression')).toEqual(['rmse', 'mae', 'r2']);
  });

  it('rejects an unknown name with the known list and close names', () => {
    const known = METRIC_NAMES.join(', ');
    let err: unknown;
    try {
      getMetric('acuracy');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(UsageError);
    expect((err as Error).message).toBe(`--metric "acuracy": unknown metric; known: ${known}; did you mean "accuracy"?`);
    // no close name: the message ends with the known list
    expect(() => getMetric('zzzzzzzzzzzzzzzz')).toThrow(new RegExp(`known: ${known}$`));
    expect(() => getMetric('__proto__')).toThrow(UsageError);
    expect(() => getMetric('toString')).toThrow(UsageError);
  });

  it('re-exports confusionMatrix', () => {
    expect(confusionMatrix(Int32Array.from([1]), Int32Array.from([0]), 2)).toEqual([
      [0, 0],
      [1, 0],
    ]);
  });
});
