/** A JSON Schema of schema/ compiled with ajv in strict mode, as an assertion for tests. */
import { Ajv } from 'ajv';
import { readFileSync } from 'node:fs';
import { expect } from 'vitest';

/** `expectValid(value)` for schema/NAME: fails with ajv's errors listed when `value` does not match. */
export function schemaCheck(name: string): (value: unknown) => void {
  const schema = JSON.parse(readFileSync(new URL(`../../schema/${name}`, import.meta.url), 'utf8'));
  const validate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(schema);
  return (value: unknown): void => {
    const ok = validate(value);
    expect(validate.errors ?? []).toEqual([]);
    expect(ok).toBe(true);
  };
}
