/** `foldwise audit`: registered on the program by run.ts. */
import type { Command } from 'commander';
import type { Io } from './run.js';

export function registerAudit(prog: Command, io: Io, setCode: (code: number) => void): void {
  void prog;
  void io;
  void setCode;
}
