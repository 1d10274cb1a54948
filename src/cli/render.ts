/**
 * `foldwise render REPORT.json --html OUT.html`: turns a JSON file written by foldwise into one
 * self-contained HTML page (src/report/html): an eval report (format foldwise-report/2, read
 * and validated as compare and gate read it), a tune report (format foldwise-tune/2, validated
 * against schema/tune.schema.json) or a gate verdict (format foldwise-gate/2, validated against
 * schema/gate.schema.json). `--html -` writes the page to standard output.
 * Exit codes: 0 written, 2 bad input or usage.
 */
import { Ajv, type ValidateFunction } from 'ajv';
import type { Command } from 'commander';
import { readFileSync } from 'node:fs';
import { readReport, schemaPath } from '../compare/read-report.js';
import type { GateVerdict } from '../model/compare.js';
import { EXIT_OK, InputError } from '../errors.js';
import { refuseOldFormat } from '../renamed.js';
import { writeFileAtomic } from '../report/atomic.js';
import { guardPaths } from './guard.js';
import { renderAuditHtml, renderEvalHtml, renderGateHtml, renderTuneHtml } from '../report/html/index.js';
import { AUDIT_SCHEMA } from '../audit/index.js';
import type { AuditReport } from '../audit/types.js';
import type { TuneReport } from '../model/tune.js';
import { TUNE_SCHEMA } from '../search/tune.js';
import { REPORT_SCHEMA } from '../version.js';
import type { Io } from './io.js';

const GATE_SCHEMA = 'foldwise-gate/2';

interface RenderFlags {
  html: string;
}

const validators = new Map<string, ValidateFunction>();
/** The compiled validator of a schema file of the package (compiled once). */
function validatorOf(file: string): ValidateFunction {
  let v = validators.get(file);
  if (!v) {
    v = new Ajv({ allErrors: false, strict: true, allowUnionTypes: true }).compile(JSON.parse(readFileSync(schemaPath(file), 'utf8')) as object);
    validators.set(file, v);
  }
  return v;
}

const oneLine = (s: string, max: number): string => {
  const t = s.replace(/\s+/g, ' ').trim();
  return t.length > max ? `${t.slice(0, max)}…` : t;
};

/** The HTML page of the foldwise JSON file at `path`. */
export function renderFile(path: string): string {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new InputError(`render ${path}: cannot be read (${(e as NodeJS.ErrnoException).code ?? 'error'}); give a JSON file written by foldwise eval, tune or gate with --json`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (e) {
    throw new InputError(`render ${path}: not JSON (${oneLine((e as Error).message, 100)}); give a file written by foldwise eval, tune or gate with --json`);
  }
  const schema = value !== null && typeof value === 'object' && !Array.isArray(value) ? (value as { schema?: unknown }).schema : undefined;
  refuseOldFormat(`render ${path}`, schema, REPORT_SCHEMA, 'rerun foldwise eval with --json to write one');
  refuseOldFormat(`render ${path}`, schema, GATE_SCHEMA, 'rerun foldwise gate with --json to write one');
  refuseOldFormat(`render ${path}`, schema, TUNE_SCHEMA, 'rerun foldwise tune with --json to write one');
  if (schema === REPORT_SCHEMA) return renderEvalHtml(readReport(path, 'render').report);
  const check = (file: string, what: string): void => {
    const validate = validatorOf(file);
    if (!validate(value)) {
      const err = validate.errors?.[0];
      throw new InputError(`render ${path}: not a valid ${what} (at ${oneLine(err?.instancePath || '/', 60)}: ${oneLine(err?.message ?? 'invalid', 80)})`);
    }
  };
  if (schema === GATE_SCHEMA) {
    check('gate.schema.json', `${GATE_SCHEMA} verdict`);
    return renderGateHtml(value as GateVerdict);
  }
  if (schema === TUNE_SCHEMA) {
    check('tune.schema.json', `${TUNE_SCHEMA} report`);
    return renderTuneHtml(value as TuneReport);
  }
  if (schema === AUDIT_SCHEMA) {
    check('audit.schema.json', `${AUDIT_SCHEMA} report`);
    return renderAuditHtml(value as AuditReport);
  }
  throw new InputError(
    `render ${path}: not a file foldwise can render (its "schema" field is ${oneLine(JSON.stringify(schema) ?? 'missing', 60)}; expected "${REPORT_SCHEMA}" from eval --json, "${GATE_SCHEMA}" from gate --json or "${TUNE_SCHEMA}" from tune --json or "${AUDIT_SCHEMA}" from audit --json)`,
  );
}

async function runRender(path: string, flags: RenderFlags, io: Io): Promise<number> {
  guardPaths([{ option: 'render', path }], [{ option: '--html', path: flags.html }]);
  const html = renderFile(path);
  if (flags.html === '-') io.stdout.write(html);
  else writeFileAtomic(flags.html, html, '--html');
  return EXIT_OK;
}

export function registerRender(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('render')
    .description('write a self-contained HTML page with charts of an eval or tune report or a gate verdict')
    .argument('<report>', 'JSON file written by foldwise eval, tune or gate with --json')
    .requiredOption('--html <file>', 'the HTML file to write, or - for standard output')
    .option('--verbose', 'print stack traces of errors')
    .action(async (path: string, flags: RenderFlags) => setCode(await runRender(path, flags, io)));
}
