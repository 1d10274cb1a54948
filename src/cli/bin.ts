#!/usr/bin/env node
/** The executable: the only file that touches `process`. */
import { run } from './run.js';

let interrupted = false;
process.on('SIGINT', () => {
  if (interrupted) process.exit(130);
  interrupted = true;
  process.stderr.write('\nfoldwise: stopping after the tasks under way (Ctrl-C again to quit at once)\n');
});

const code = await run(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  stdin: process.stdin,
  env: process.env,
  cwd: process.cwd(),
  interrupted: () => interrupted,
});
process.exitCode = code;
