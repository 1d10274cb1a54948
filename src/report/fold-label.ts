/**
 * How folds are named in messages, reports and task ids: `r{repeat}.f{fold}`, both counted
 * from 1 (repeat 0, fold 2 is r1.f3).
 */
export function foldLabel(f: { readonly repeat: number; readonly fold: number }): string {
  return `r${f.repeat + 1}.f${f.fold + 1}`;
}
