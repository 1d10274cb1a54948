/**
 * The colours of the HTML report, chosen for people with any common colour-vision deficiency:
 * the series colours differ in lightness as well as hue (a dark blue, a light orange, a
 * mid blue-green, a dark purple, a sandy yellow, a grey), and no chart relies on red against
 * green. Every mark that carries a value also carries it as text or in its tooltip, and the
 * confusion shading is one hue that only changes in lightness.
 *
 * The hues follow the advice of Okabe & Ito, "Color Universal Design" (2008, free online):
 * pair blue with orange, avoid red against green, vary lightness. The hex values are our own.
 */
export const INK = '#1c2230';
export const MUTED = '#596273';
export const GRID = '#e2e5ea';
export const AXIS = '#8a919e';
export const BOX_FILL = '#d5e3f2';
export const BOX_STROKE = '#1f5a8c';
export const POINT = '#10304d';
export const INTERVAL = '#b85a00';
export const BASELINE = '#5f5f5f';
export const BETTER = '#1f5a8c';
export const WORSE = '#b85a00';
export const UNCLEAR = '#7d8591';
export const PASS = '#1f5a8c';
export const FAIL = '#9c3d00';

/** Series colours in order; the baseline learner is always drawn in BASELINE grey. */
export const SERIES: readonly string[] = ['#1f5a8c', '#e69a3c', '#2f8f83', '#6b3d8f', '#c9b037', '#4d8fcf'];

/** The shade for a share 0..1 in the confusion table: from near-white to dark blue. */
export function shade(share: number): { background: string; text: string } {
  const s = Math.min(1, Math.max(0, Number.isFinite(share) ? share : 0));
  // lightness from 97% down to 30% of one blue hue (210 degrees)
  const light = 97 - 67 * s;
  return { background: `hsl(210, 55%, ${light.toFixed(1)}%)`, text: light < 58 ? '#ffffff' : INK };
}
