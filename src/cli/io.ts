/**
 * What a command is given to talk to the world: its streams, environment, folder and stop
 * signals. `bin.ts` makes the real one from `process`; tests make their own. Every command file
 * imports it from here (not from run.ts, which registers the commands), so the CLI's files form
 * no import circle.
 */
import type { Readable } from 'node:stream';

export interface Io {
  readonly stdout: { write(text: string): unknown };
  readonly stderr: { write(text: string): unknown };
  readonly stdin?: Readable;
  readonly env?: Readonly<Record<string, string | undefined>>;
  /** the working directory, which relative module: learner paths are resolved against */
  readonly cwd?: string;
  /** true once the user asked to stop (SIGINT); the run then stops cleanly */
  readonly interrupted?: () => boolean;
  /** aborted (reason: the signal's name) when the user or a scheduler asks the run to stop */
  readonly stop?: AbortSignal;
  /** catch stop signals from now on (until the returned function is called); without it they keep their default action */
  readonly armStops?: () => () => void;
}
