/**
 * The search space of `foldwise tune`: one or more `--learner` specs whose option values may be
 * lists and ranges (see value-syntax.ts). The grid of one spec is the product of its options'
 * value lists (options not written keep the learner's default); several specs make one search
 * over the union of their grids. Candidates are identified by their canonical spec text
 * (formatSpec), so the same model reached from two specs is one candidate (with a warning).
 *
 * Size: the grid size is counted before anything is built. Without --sample a grid above the
 * candidate limit (DEFAULT_MAX_CANDIDATES unless --max-candidates raises it) is refused, and a
 * continuous range is refused (it has no finite grid).
 *
 * Random search (--sample N; Bergstra & Bengio 2012, "Random Search for Hyper-Parameter
 * Optimization", JMLR 13:281-305, free at https://jmlr.org/papers/v13/bergstra12a.html): N
 * distinct candidates drawn with the generator from deriveSeed(seed, "sample"). Each draw picks
 * a spec (with probability proportional to its grid size when every grid is finite, otherwise
 * uniformly), then every option independently: a uniform item of a finite list, or a uniform
 * real in a continuous interval rounded to 6 significant digits. A repeat of a candidate already
 * drawn is drawn again, so a finite grid is sampled uniformly without replacement; after
 * 50 N + 1000 draws the search stops with the distinct ones it has (with a warning). When N is at
 * least the grid size the whole grid is taken instead (with a warning).
 */
import { UsageError } from '../errors.js';
import { getLearner, parseLearnerSpec } from '../learners/index.js';
import { formatSpec, resolveParams } from '../learners/spec.js';
import type { Learner, Params, Task } from '../learning.js';
import { createRng, deriveSeed } from '../rng.js';
import { type Axis, axisSize, parseAxis } from './value-syntax.js';

/** Largest search tried without --max-candidates. */
export const DEFAULT_MAX_CANDIDATES = 200;
/** Largest value --max-candidates accepts. */
export const MAX_CANDIDATES_LIMIT = 100_000;

export interface SpecSpace {
  /** the spec as given */
  readonly text: string;
  readonly learner: Learner;
  /** the options written, in the order written */
  readonly axes: readonly Axis[];
  /** number of grid points (Infinity with a continuous interval) */
  readonly size: number;
}

export interface SearchSpace {
  readonly specs: readonly SpecSpace[];
  /** sum of the specs' grid sizes, before merging candidates that two specs share */
  readonly size: number;
}

export interface SearchCandidate {
  /** 0-based position in the search */
  readonly id: number;
  readonly learner: Learner;
  /** canonical spec text: name plus the options that differ from the defaults */
  readonly spec: string;
  readonly params: Params;
}

export interface SearchLimits {
  /** --sample N: number of candidates to draw */
  readonly sample?: number;
  /** the candidate limit (default DEFAULT_MAX_CANDIDATES) */
  readonly maxCandidates?: number;
}

export interface SearchPlan {
  /** grid size; null when the space has a continuous interval */
  readonly gridSize: number | null;
  /** candidates that will be tried */
  readonly tried: number;
  readonly sampled: boolean;
  readonly limit: number;
  readonly warnings: readonly string[];
}

/** Parses the --learner specs of a search; checks every value against its learner. */
export function parseSearchSpace(texts: readonly string[]): SearchSpace {
  if (texts.length === 0) throw new UsageError('--learner: a search needs at least one learner spec');
  const specs = texts.map((text): SpecSpace => {
    const parsed = parseLearnerSpec(text);
    const learner = getLearner(parsed.name);
    const axes = parsed.options.map(([key, raw]) => parseAxis(learner, parsed.text, key, raw));
    const size = axes.reduce((s, a) => s * axisSize(a), 1);
    return { text: parsed.text, learner, axes, size };
  });
  return { specs, size: specs.reduce((s, p) => s + p.size, 0) };
}

function checkCount(name: string, v: number | undefined, fallback: number): number {
  if (v === undefined) return fallback;
  if (!Number.isInteger(v) || v < 1 || v > MAX_CANDIDATES_LIMIT) {
    throw new UsageError(`${name} ${v}: expected a whole number from 1 to ${MAX_CANDIDATES_LIMIT}`);
  }
  return v;
}

/** Checks the search against the limits and says how many candidates will be tried; builds nothing. */
export function planSearch(space: SearchSpace, limits: SearchLimits): SearchPlan {
  const limit = checkCount('--max-candidates', limits.maxCandidates, DEFAULT_MAX_CANDIDATES);
  const sample = limits.sample === undefined ? undefined : checkCount('--sample', limits.sample, 0);
  const gridSize = Number.isFinite(space.size) ? space.size : null;
  const warnings: string[] = [];
  if (sample === undefined) {
    if (gridSize === null) {
      const spec = space.specs.find((s) => !Number.isFinite(s.size))!;
      const axis = spec.axes.find((a) => a.kind === 'continuous')!;
      throw new UsageError(`--learner ${spec.text}: ${axis.name} is a continuous range; give it a step (A..B+S) or use --sample N`);
    }
    if (gridSize > limit) {
      throw new UsageError(`the grid has ${gridSize} candidates, more than the limit of ${limit}; narrow it, use --sample N, or raise --max-candidates`);
    }
    return { gridSize, tried: gridSize, sampled: false, limit, warnings };
  }
  if (sample > limit) throw new UsageError(`--sample ${sample}: more than the limit of ${limit} candidates; raise --max-candidates`);
  if (gridSize !== null && sample >= gridSize) {
    warnings.push(`--sample ${sample} is at least the grid size (${gridSize}); the whole grid is searched`);
    return { gridSize, tried: gridSize, sampled: false, limit, warnings };
  }
  return { gridSize, tried: sample, sampled: true, limit, warnings };
}

type Draft = { readonly spec: SpecSpace; readonly texts: readonly string[] };

function* gridOf(spec: SpecSpace): Generator<Draft> {
  const axes = spec.axes;
  const at = new Array<number>(axes.length).fill(0);
  const size = (a: Axis) => (a.kind === 'finite' ? a.texts.length : 0);
  for (;;) {
    yield { spec, texts: axes.map((a, i) => (a.kind === 'finite' ? a.texts[at[i]] : '')) };
    let i = axes.length - 1;
    while (i >= 0 && ++at[i] === size(axes[i])) at[i--] = 0;
    if (i < 0) return;
  }
}

function draw(space: SearchSpace, rng: ReturnType<typeof createRng>): Draft {
  const specs = space.specs;
  let spec: SpecSpace;
  if (Number.isFinite(space.size)) {
    let u = rng.next() * space.size;
    spec = specs[specs.length - 1];
    for (const s of specs) {
      if (u < s.size) {
        spec = s;
        break;
      }
      u -= s.size;
    }
  } else spec = specs[rng.int(specs.length)];
  const texts = spec.axes.map((a) =>
    a.kind === 'finite' ? a.texts[rng.int(a.texts.length)] : String(Number((a.from + rng.next() * (a.to - a.from)).toPrecision(6))),
  );
  return { spec, texts };
}

/**
 * The candidates of a search, resolved for the task: the whole grid in order (first option
 * varying slowest, specs in the order given), or a seeded sample.
 */
export function searchCandidates(space: SearchSpace, task: Task, limits: SearchLimits, seed: number): { candidates: SearchCandidate[]; plan: SearchPlan } {
  const plan = planSearch(space, limits);
  const warnings = [...plan.warnings];
  const candidates: SearchCandidate[] = [];
  const bySpec = new Map<string, string>();
  const add = (d: Draft, warnRepeat: boolean): boolean => {
    const params = resolveParams(d.spec.learner, { text: d.spec.text, name: d.spec.learner.name, options: d.spec.axes.map((a, i) => [a.name, d.texts[i]] as const) }, task);
    const spec = formatSpec(d.spec.learner, params);
    const first = bySpec.get(spec);
    if (first !== undefined) {
      if (warnRepeat && first !== d.spec.text) warnings.push(`--learner ${d.spec.text} and ${first} both give ${spec}; it is tried once`);
      return false;
    }
    bySpec.set(spec, d.spec.text);
    candidates.push({ id: candidates.length, learner: d.spec.learner, spec, params });
    return true;
  };
  if (!plan.sampled) {
    for (const s of space.specs) for (const d of gridOf(s)) add(d, true);
  } else {
    const rng = createRng(deriveSeed(seed, 'sample'));
    const most = 50 * plan.tried + 1000;
    for (let k = 0; k < most && candidates.length < plan.tried; k++) add(draw(space, rng), false);
    if (candidates.length < plan.tried) {
      warnings.push(`--sample ${plan.tried}: only ${candidates.length} distinct candidates found in ${most} draws`);
    }
  }
  return { candidates, plan: { ...plan, tried: candidates.length, warnings } };
}
