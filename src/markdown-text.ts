/**
 * Text for Markdown, shared by every renderer (reports, comparisons, the gate, the audit): table
 * cells and inline text escaped, code spans, numbers with four decimals. It sits at the bottom
 * of the house so that a stage's own renderer never has to import the report writers.
 */

const DIGITS = 4;

/** Escapes text for a Markdown table cell (pipes, backslashes, line breaks, HTML brackets). */
export function cell(text: string): string {
  return text.replace(/\\/g, '\\\\').replace(/\|/g, '\\|').replace(/\r?\n|\r/g, ' ').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/** Text for Markdown outside a table: like `cell`, but `|` needs no escape there. */
export function inline(text: string): string {
  return text.replace(/\\/g, '\\\\').replace(/\r?\n|\r/g, ' ').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/** A code span outside a table: the text as it is (Markdown reads no escapes in code spans). */
export function code(text: string): string {
  const t = text.replace(/\r?\n|\r/g, ' ');
  return t.includes('`') ? `\`\` ${t} \`\`` : `\`${t}\``;
}

export function num(v: number | null | undefined): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '–' : v.toFixed(DIGITS);
}
