/**
 * Reads an eval report file for compare and gate, refusing anything that is not one: a missing
 * or unreadable file, text that is not JSON, or JSON that does not validate against
 * schema/report.schema.json (format foldwise-report/2). Every refusal is an InputError of one
 * line naming the file: "<label> <path>: <what is wrong>".
 *
 * The schema is found by walking up from this module's folder to the first folder holding
 * schema/report.schema.json (the package root, from src/compare and from dist/src/compare).
 */
import { Ajv, type ValidateFunction } from 'ajv';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError } from '../errors.js';
import { refuseOldFormat } from '../renamed.js';
import type { Report } from '../model/report.js';
import { checkScoreRanges } from './score-ranges.js';
import { REPORT_SCHEMA } from '../version.js';

export interface LoadedReport {
  readonly path: string;
  /** the file's text, byte for byte as read (gate --accept copies it) */
  readonly text: string;
  readonly report: Report;
}

/** The path of a schema file of the package (e.g. "report.schema.json"). */
export function schemaPath(name: string): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    const p = join(dir, 'schema', name);
    if (existsSync(p)) return p;
    const up = dirname(dir);
    if (up === dir) break;
    dir = up;
  }
  throw new Error(`schema/${name} not found above ${dirname(fileURLToPath(import.meta.url))}`);
}

let validator: ValidateFunction | undefined;
function validateReport(): ValidateFunction {
  if (validator) return validator;
  const schema = JSON.parse(readFileSync(schemaPath('report.schema.json'), 'utf8')) as object;
  validator = new Ajv({ allErrors: false, strict: true, allowUnionTypes: true }).compile(schema);
  return validator;
}

const oneLine = (s: string, max = 120): string => {
  const t = s.replace(/\s+/g, ' ').trim();
  return t.length > max ? `${t.slice(0, max)}…` : t;
};

export function readReport(path: string, label: string): LoadedReport {
  const where = `${label} ${path}`;
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? 'error';
    throw new InputError(`${where}: cannot be read (${code}); give the path of a JSON report written by foldwise eval --json`);
  }
  let value: unknown;
  try {
    value = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (e) {
    throw new InputError(`${where}: not JSON (${oneLine((e as Error).message)}); give a report written by foldwise eval --json`);
  }
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new InputError(`${where}: not a foldwise eval report (the JSON is not an object)`);
  }
  const schema = (value as { schema?: unknown }).schema;
  refuseOldFormat(where, schema, REPORT_SCHEMA, 'rerun foldwise eval with --json to write one');
  if (schema !== REPORT_SCHEMA) {
    throw new InputError(`${where}: not a foldwise eval report (its "schema" field is ${oneLine(JSON.stringify(schema) ?? 'missing', 60)}, expected "${REPORT_SCHEMA}")`);
  }
  const validate = validateReport();
  if (!validate(value)) {
    const err = validate.errors?.[0];
    const at = err?.instancePath || '/';
    throw new InputError(`${where}: not a valid ${REPORT_SCHEMA} report (at ${oneLine(at, 60)}: ${oneLine(err?.message ?? 'invalid', 80)})`);
  }
  checkScoreRanges(where, value as Report);
  return { path, text, report: value as Report };
}
