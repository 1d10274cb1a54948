#!/usr/bin/env node
/** The executable: the only file that touches `process`. */
import { run } from './run.js';

const code = await run(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  stdin: process.stdin,
  env: process.env,
});
process.exitCode = code;
