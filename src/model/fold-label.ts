/**
 * How folds are named in messages, reports and task ids: `r{repeat}.f{fold}`, both counted
 * from 1 (repeat 0, fold 2 is r1.f3).
 */
export function foldLabel(f: { readonly repeat: number; readonly fold: number }): string {
  return `r${f.repeat + 1}.f${f.fold + 1}`;
}

/** "5 folds", "1 fold", or for a holdout plan "1 validation split": how plan lines count folds. */
export function foldCount(p: { readonly kind: string; readonly folds: number }): string {
  if (p.kind === 'holdout') return `${p.folds} validation split${p.folds === 1 ? '' : 's'}`;
  return `${p.folds} fold${p.folds === 1 ? '' : 's'}`;
}
