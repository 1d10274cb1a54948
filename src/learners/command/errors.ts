/**
 * A fold of a `command:` learner failed: the program could not start, exited with another
 * status than 0, ran out of time, or wrote no valid predictions. The runner either stops the
 * run with it (exit code 2, --on-fold-error fail) or records the fold as failed (skip).
 */
import { InputError } from '../../errors.js';

export class CommandFoldError extends InputError {}
