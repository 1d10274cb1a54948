/**
 * What a command leaves behind is removed on every path: `onCleanup` registers a removal that
 * `runCleanups` performs once, when `run()` ends (success or error) and, in the executable, when
 * the process exits (a second Ctrl-C). Removals are synchronous so they can run at exit.
 */
const pending: (() => void)[] = [];

export function onCleanup(fn: () => void): void {
  pending.push(fn);
}

export function runCleanups(): void {
  while (pending.length) {
    try {
      pending.pop()!();
    } catch {
      // best effort: one failed removal does not keep the others from running
    }
  }
}
