/**
 * Typed access to the design's reference libraries (ml-random-forest, ml-knn). They ship
 * CommonJS builds with loose or missing types, so they are loaded through createRequire and
 * given the small interfaces foldwise uses.
 */
import { createRequire } from 'node:module';
import type { Matrix } from '../learning.js';

const require = createRequire(import.meta.url);

export interface RefForestOptions {
  nEstimators: number;
  maxFeatures: number;
  replacement: boolean;
  seed: number;
  useSampleBagging: boolean;
  noOOB: boolean;
  treeOptions: { maxDepth?: number; minNumSamples?: number; gainFunction?: string };
}

export interface RefForest {
  train(X: number[][], y: number[]): void;
  predict(X: number[][]): number[];
  /** per-row, per-tree predictions (rows x trees) */
  predictionValues(X: number[][]): { rows: number; getRow(i: number): number[] };
  toJSON(): unknown;
}

export interface RefForestModule {
  RandomForestClassifier: { new (options: RefForestOptions): RefForest; load(json: unknown): RefForest };
  RandomForestRegression: { new (options: RefForestOptions & { selectionMethod?: 'mean' | 'median' }): RefForest; load(json: unknown): RefForest };
}

export interface RefKnn {
  predict(X: number[][]): number[];
  toJSON(): unknown;
}

export interface RefKnnClass {
  new (X: number[][], y: number[], options: { k: number }): RefKnn;
  load(json: unknown): RefKnn;
}

export const refForest = (): RefForestModule => require('ml-random-forest') as RefForestModule;

export const refKnn = (): RefKnnClass => {
  const m = require('ml-knn') as RefKnnClass | { default: RefKnnClass };
  return 'default' in m ? m.default : m;
};

/** A row-major matrix as the nested arrays the reference libraries take. */
export function rowsOf(X: Matrix): number[][] {
  const out = new Array<number[]>(X.rows);
  for (let i = 0; i < X.rows; i++) out[i] = Array.from(X.data.subarray(i * X.cols, (i + 1) * X.cols));
  return out;
}
