/** The audit JSON Schema (schema/audit.schema.json) compiled with ajv in strict mode, as for the eval report. */
import { Ajv } from 'ajv';
import { readFileSync } from 'node:fs';
import { expect } from 'vitest';

const schema = JSON.parse(readFileSync(new URL('../../schema/audit.schema.json', import.meta.url), 'utf8'));
const validate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(schema);

/** Asserts that a report (after a JSON round trip, as a reader sees it) validates. */
export function expectValidAudit(report: unknown): void {
  const data = JSON.parse(JSON.stringify(report));
  const ok = validate(data);
  expect(validate.errors ?? []).toEqual([]);
  expect(ok).toBe(true);
}
