/** Model notes (Model.notes) as results, journals, parts and reports carry them. */

/**
 * A model's notes as kept in results and reports: a fresh object of finite numbers under
 * lower-case hyphenated names, or undefined when there are none (anything else is dropped).
 */
export function notesOf(v: unknown): Readonly<Record<string, number>> | undefined {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) return undefined;
  const out: Record<string, number> = {};
  let any = false;
  for (const [k, x] of Object.entries(v)) {
    if (/^[a-z][a-z0-9-]*$/.test(k) && typeof x === 'number' && Number.isFinite(x)) {
      out[k] = x;
      any = true;
    }
  }
  return any ? out : undefined;
}
