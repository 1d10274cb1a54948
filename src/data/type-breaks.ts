/**
 * Messages for a column that is numbers or dates but for a few cells (`breaks`, found by the
 * loader), when that column is used where its type matters: the target and --order.
 */
import { quoted } from './quote.js';
import type { CategoricalColumn, Column, Table, TypeBreak } from './types.js';

function cells(b: TypeBreak): string {
  const list = b.examples.map((e) => `line ${e.line}: ${quoted(e.text)}`).join(', ');
  return b.cells > b.examples.length ? `${list} and ${b.cells - b.examples.length} more` : list;
}

/** Set when the target is numbers but for a few cells and no --task was given. */
export function numericTargetBreak(table: Table, col: Column): string | undefined {
  if (col.kind !== 'categorical' || col.breaks?.expected !== 'numbers') return undefined;
  const b = col.breaks;
  return `${table.source}: target ${quoted(col.name)} is numeric but for ${b.cells} cell${b.cells === 1 ? '' : 's'} (${cells(b)}); list such texts with --missing to leave those rows out, or give --task classification to read every value as a class label`;
}

/** Set when an --order column is numbers or dates but for a few cells. */
export function orderBreak(table: Table, col: CategoricalColumn): string | undefined {
  const b = col.breaks;
  if (!b) return undefined;
  const first = b.examples[0];
  const what = b.expected === 'dates' ? 'is not a date that exists' : 'is not a number';
  return `${table.source}: line ${first.line}: --order column ${quoted(col.name)} holds ${quoted(first.text)}, which ${what} (the other cells are ${b.expected}${b.cells > 1 ? `; ${b.cells} such cells: ${cells(b)}` : ''}); fix the cell: every row needs an order value`;
}
