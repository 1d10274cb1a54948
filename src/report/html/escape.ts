/**
 * Escaping for text that goes into the HTML page or its inline SVG: every string that comes
 * from the data or the command line (column names, class labels, learner specs, file paths,
 * warnings) passes through `esc` before it is written, in element text and in attribute values
 * alike. The five characters with a meaning in markup become character references:
 * & -> &amp;  < -> &lt;  > -> &gt;  " -> &quot;  ' -> &#39;
 * so a value can neither open a tag nor leave a quoted attribute. Control characters other than
 * tab and line feed, which XML (and so inline SVG) does not allow, become U+FFFD.
 *
 * Source: the HTML Living Standard, section 13.1.4 "Character references", and the OWASP
 * "Cross Site Scripting Prevention Cheat Sheet", rule 1 and rule 2 (both free online).
 */
const REFS: ReadonlyMap<string, string> = new Map([
  ['&', '&amp;'],
  ['<', '&lt;'],
  ['>', '&gt;'],
  ['"', '&quot;'],
  ["'", '&#39;'],
]);

export function esc(text: string): string {
  if (typeof text !== 'string') throw new TypeError(`esc: expected a string, got ${typeof text}`);
  // eslint-disable-next-line no-control-regex
  return text.replace(/[&<>"']/g, (c) => REFS.get(c) ?? c).replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f\ufffe\uffff]/g, '\ufffd');
}

/** Shortens text to at most `max` characters (an ellipsis marks the cut); escape the result. */
export function clip(text: string, max: number): string {
  const chars = Array.from(text);
  return chars.length <= max ? text : `${chars.slice(0, Math.max(1, max - 1)).join('')}…`;
}
