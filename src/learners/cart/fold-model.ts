/**
 * The model a forest fit leaves when the runner only predicts the fold's test rows
 * (FitContext.predictOnly, fitCartOnFold): those rows' predictions, made while the trees were
 * grown, and no trees. It answers predict and probabilities for that fold's test matrix only (the
 * same object the runner passes) and refuses any other matrix; it cannot be saved.
 */
import { InputError } from '../../errors.js';
import type { FoldView, Matrix, Model } from '../../learning.js';
import type { CartKind } from './flat-forest.js';
import { mostProbable } from './flat-forest.js';
import type { FoldOutputs } from './fit-trees.js';

export function foldModel(kind: CartKind, fitted: FoldOutputs, fold: FoldView): Model {
  const only = (X: Matrix, what: string): void => {
    if (X !== fold.test) {
      throw new InputError(`${kind}: this fit predicted the test rows of fold ${fold.label} only (predictOnly) and kept no trees; it cannot ${what} other rows`);
    }
  };
  const rows = fold.test.rows;
  const model: Model = {
    predict: (X: Matrix) => {
      only(X, 'predict');
      return fitted.task === 'classification' ? mostProbable(fitted.outputs, rows, fitted.classCount) : fitted.outputs.slice();
    },
    toJSON: () => {
      throw new InputError(`${kind}: a fit made with predictOnly keeps no trees and cannot be saved`);
    },
  };
  if (fitted.task === 'regression') return model;
  return {
    ...model,
    probabilities: (X: Matrix) => {
      only(X, 'give probabilities for');
      return fitted.outputs.slice();
    },
  };
}
