/**
 * Issue 21: the package the way users get it. `npm pack` (which builds first), the tarball's file
 * list (what it needs and nothing else), then an install into an empty folder outside the
 * repository: `npx foldwise --version`, an `eval` of the bundled example, the core API from a
 * plain ESM script and from TypeScript with type checking. The version printed, the report's
 * `tool` field and the API's VERSION all equal package.json's version.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { schemaCheck } from '../helpers/schema.js';
import { REPO, runProgram } from './helpers/shell.js';

const pkg = JSON.parse(readFileSync(join(REPO, 'package.json'), 'utf8')) as { name: string; version: string };
// npm's own variables from `npm run` would steer the inner npm calls; users have none of them
const env = Object.fromEntries(Object.entries(process.env).filter(([k]) => !/^npm_/i.test(k)));
let root = '';
let tarball = '';

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), 'foldwise-package-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** What the tarball may hold: the build (no source maps: the sources are not shipped), schemas, examples, docs. */
const ALLOWED = /^(package\.json|README\.md|LICENSE|dist\/src\/[\w/.-]+\.(js|d\.ts)|schema\/[a-z]+\.schema\.json|examples\/[\w/.-]+)$/;

describe('the package as users install it', () => {
  it('packs what it needs and nothing else', async () => {
    const packed = await runProgram('npm', ['pack', '--json', '--pack-destination', root], { cwd: REPO, env });
    expect(packed.code).toBe(0);
    const [info] = JSON.parse(packed.stdout) as { filename: string; size: number; unpackedSize: number; files: { path: string }[] }[];
    const files = info.files.map((f) => f.path);
    for (const needed of ['package.json', 'README.md', 'LICENSE', 'dist/src/cli/bin.js', 'dist/src/index.js', 'dist/src/index.d.ts', 'dist/src/run/worker.js',
      'schema/report.schema.json', 'examples/packhouse/fruit-grading.csv']) expect(files).toContain(needed);
    expect(files.filter((f) => !ALLOWED.test(f))).toEqual([]);
    expect(files.filter((f) => /(^|\/)(test|bench)\//.test(f) || f.endsWith('.map') || f.startsWith('src/'))).toEqual([]);
    tarball = join(root, info.filename);
    console.log(`npm pack: ${info.filename}, ${(info.size / 1024).toFixed(0)} KiB packed, ${(info.unpackedSize / 1024).toFixed(0)} KiB unpacked, ${files.length} files`);
  });

  it('installs into an empty folder and runs: --version, eval of the example, the API from ESM and type-checked TypeScript', async () => {
    expect(tarball).not.toBe('');
    const app = join(root, 'app');
    mkdirSync(app);
    writeFileSync(join(app, 'package.json'), `${JSON.stringify({ name: 'foldwise-user', private: true, type: 'module' }, null, 2)}\n`);
    const install = await runProgram('npm', ['install', tarball, '--no-audit', '--no-fund', '--prefer-offline'], { cwd: app, env });
    expect(install.stderr).not.toMatch(/ERR!/);
    expect(install.code).toBe(0);

    const version = await runProgram('npx', ['foldwise', '--version'], { cwd: app, env });
    expect(version.code).toBe(0);
    expect(version.stdout).toBe(`${pkg.version}\n`);

    const example = 'node_modules/foldwise/examples/packhouse/fruit-grading.csv';
    const cliRun = await runProgram('npx', ['foldwise', 'eval', example, '--target', 'grade', '--drop', 'lot_id', '--group', 'orchard', '--no-timing', '--json', 'report.json'], { cwd: app, env });
    expect(cliRun.code).toBe(0);
    const report = JSON.parse(readFileSync(join(app, 'report.json'), 'utf8'));
    expect(report.tool).toEqual({ name: pkg.name, version: pkg.version });
    schemaCheck('report.schema.json')(report);

    // the core API from a plain ESM script: the same learners and scores as the CLI's run
    writeFileSync(join(app, 'use.mjs'), [
      "import { loadCsv, evaluate, VERSION } from 'foldwise';",
      'const table = await loadCsv({ path: process.argv[2] });',
      "const report = evaluate(table, { target: 'grade', drop: ['lot_id'], group: 'orchard', timing: false });",
      'console.log(JSON.stringify({ VERSION, tool: report.tool, learners: report.learners.map((l) => [l.spec, l.folds, l.pooled]) }));',
      '',
    ].join('\n'));
    const esm = await runProgram('node', ['use.mjs', example], { cwd: app, env });
    expect(esm.stderr).toBe('');
    expect(esm.code).toBe(0);
    const api = JSON.parse(esm.stdout);
    expect(api.VERSION).toBe(pkg.version);
    expect(api.tool).toEqual(report.tool);
    expect(api.learners.length).toBeGreaterThan(1);
    expect(api.learners).toEqual(report.learners.map((l: { spec: string; folds: unknown; pooled: unknown }) => [l.spec, l.folds, l.pooled]));

    // TypeScript against the shipped declarations (tsc of this checkout; @types/node as a user has it)
    const tsconfig = (files: string[]): string => JSON.stringify({
      compilerOptions: { target: 'ES2022', module: 'NodeNext', moduleResolution: 'NodeNext', strict: true, noEmit: true, skipLibCheck: false,
        types: ['node'], typeRoots: [join(REPO, 'node_modules', '@types')] },
      files,
    });
    writeFileSync(join(app, 'use.ts'), [
      "import { evaluate, loadCsv, VERSION, type EvaluateOptions, type Report } from 'foldwise';",
      "const options: EvaluateOptions = { target: 'grade', drop: ['lot_id'], group: 'orchard', plan: 'kfold:5', seed: 7 };",
      "const report: Report = evaluate(await loadCsv({ path: 'data.csv' }), options);",
      'const version: string = report.tool.version;',
      'export const same: boolean = version === VERSION;',
      '',
    ].join('\n'));
    writeFileSync(join(app, 'wrong.ts'), [
      "import { type EvaluateOptions } from 'foldwise';",
      'export const options: EvaluateOptions = { target: 42 };',
      '',
    ].join('\n'));
    writeFileSync(join(app, 'tsconfig.json'), tsconfig(['use.ts']));
    writeFileSync(join(app, 'tsconfig.wrong.json'), tsconfig(['wrong.ts']));
    const tsc = join(REPO, 'node_modules', 'typescript', 'bin', 'tsc');
    const typed = await runProgram('node', [tsc, '-p', 'tsconfig.json'], { cwd: app, env });
    expect(typed.stdout).toBe('');
    expect(typed.code).toBe(0);
    // the declarations are really read: a wrong option type is caught
    const wrong = await runProgram('node', [tsc, '-p', 'tsconfig.wrong.json'], { cwd: app, env });
    expect(wrong.code).not.toBe(0);
    expect(wrong.stdout).toMatch(/wrong\.ts\(2,\d+\): error TS2322: Type 'number' is not assignable to type 'string'/);
  });
});
