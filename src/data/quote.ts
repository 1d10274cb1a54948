/** Longest user text quoted whole in a message; longer texts are cut with "...". */
const QUOTE_MAX = 80;

/**
 * User text (a cell, a column name, an option value) quoted for a one-line message: JSON string
 * syntax, so line breaks and control characters are escaped and the message stays one line, and
 * cut to QUOTE_MAX characters so a 5 MB cell does not make a 5 MB message.
 */
export function quoted(text: string): string {
  return JSON.stringify(text.length > QUOTE_MAX ? `${text.slice(0, QUOTE_MAX - 3)}...` : text);
}
