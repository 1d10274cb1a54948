/**
 * Report files are written whole or not at all (src/report/atomic.ts), and the writer does not
 * damage what the path points at: a symbolic link stays a link (the file it names is replaced),
 * and a device such as a null device is written in place rather than renamed over.
 */
import { execFileSync } from 'node:child_process';
import { lstatSync, mkdirSync, readdirSync, readFileSync, readlinkSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkWritable, writeFileAtomic } from '../../src/report/atomic.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();

/** A character device made like /dev/null (major 1, minor 3, Linux), where mknod is allowed. */
function makeNullDevice(path: string): boolean {
  try {
    execFileSync('mknod', [path, 'c', '1', '3'], { stdio: 'ignore' });
    return statSync(path).isCharacterDevice();
  } catch {
    return false;
  }
}

describe('atomic report writes', () => {
  it('writes the whole text and leaves no temporary file', () => {
    const dir = join(tmp.dir, 'plain');
    mkdirSync(dir);
    const text = 'x'.repeat(3 * 1024 * 1024) + '\n';
    writeFileAtomic(join(dir, 'r.json'), text, '--json');
    expect(readFileSync(join(dir, 'r.json'), 'utf8')).toBe(text);
    expect(readdirSync(dir)).toEqual(['r.json']);
  });

  it('follows a symbolic link and keeps it', () => {
    const dir = join(tmp.dir, 'link');
    mkdirSync(dir);
    writeFileSync(join(dir, 'real.json'), 'old');
    symlinkSync('real.json', join(dir, 'r.json'));
    writeFileAtomic(join(dir, 'r.json'), 'new', '--json');
    expect(lstatSync(join(dir, 'r.json')).isSymbolicLink()).toBe(true);
    expect(readlinkSync(join(dir, 'r.json'))).toBe('real.json');
    expect(readFileSync(join(dir, 'real.json'), 'utf8')).toBe('new');
  });

  it('refuses a name ending in a folder separator before anything is written', () => {
    expect(() => checkWritable(`${join(tmp.dir, 'nodir')}/`, '--markdown')).toThrow(/--markdown .*nodir\/: ends with a folder separator; give a file name/);
  });

  const device = join(tmp.dir, 'null-device');
  it.skipIf(!makeNullDevice(device))('writes to a device in place instead of replacing it', () => {
    writeFileAtomic(device, 'discarded\n', '--json');
    expect(statSync(device).isCharacterDevice()).toBe(true);
    expect(readdirSync(tmp.dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});
