/**
 * A linear scale from a data interval to a pixel interval, with "nice" tick values: steps of
 * 1, 2 or 5 times a power of ten, chosen so that about `count` ticks cover the interval, and
 * the interval widened to whole steps.
 *
 *   step = the smallest of {1, 2, 5} x 10^floor(log10(span / count)) that is >= span / count
 *   pixel(v) = r0 + (v - d0) / (d1 - d0) * (r1 - r0)
 *
 * Source: P. S. Heckbert, "Nice numbers for graph labels", Graphics Gems (1990), the same
 * 1-2-5 idea in a simpler form (from memory).
 */
export interface Scale {
  readonly domain: readonly [number, number];
  readonly ticks: readonly number[];
  /** decimals that show every tick exactly */
  readonly decimals: number;
  (v: number): number;
}

export function niceStep(span: number, count: number): number {
  if (!(span > 0) || !Number.isFinite(span)) throw new RangeError(`niceStep: span must be a positive number, got ${span}`);
  if (!(count >= 1)) throw new RangeError(`niceStep: count must be at least 1, got ${count}`);
  const raw = span / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 5, 10]) if (m * power >= raw * (1 - 1e-9)) return m * power;
  return 10 * power;
}

/** A nice linear scale covering `lo`..`hi` onto pixels `r0`..`r1`. */
export function linearScale(lo: number, hi: number, r0: number, r1: number, count = 6): Scale {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError(`linearScale: bounds must be finite, got ${lo} and ${hi}`);
  if (hi < lo) [lo, hi] = [hi, lo];
  if (hi - lo < 1e-12 * Math.max(1, Math.abs(hi))) {
    const pad = Math.abs(hi) > 0 ? Math.abs(hi) * 0.05 : 0.5;
    lo -= pad;
    hi += pad;
  }
  const step = niceStep(hi - lo, count);
  const d0 = Math.floor(lo / step + 1e-9) * step;
  const d1 = Math.ceil(hi / step - 1e-9) * step;
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const ticks: number[] = [];
  for (let i = 0; d0 + i * step <= d1 + step * 1e-9; i++) ticks.push(Number((d0 + i * step).toFixed(decimals)));
  const f = ((v: number) => r0 + ((v - d0) / (d1 - d0)) * (r1 - r0)) as Scale;
  return Object.assign(f, { domain: [d0, d1] as const, ticks, decimals });
}
