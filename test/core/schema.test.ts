/** The published JSON Schema is the one generated from the loader's field table (no drift). */
import { readFileSync } from 'node:fs';
import { expect, it } from 'vitest';
import { scenarioSchema } from '../../src/scenario/schema.js';

it('scenarios/railpulse.schema.json equals the schema generated from the loader (run npm run schema)', () => {
  expect(JSON.parse(readFileSync('scenarios/railpulse.schema.json', 'utf8'))).toEqual(scenarioSchema());
});

import Ajv2020 from 'ajv/dist/2020.js';
import { readdirSync } from 'node:fs';

it('every demo scenario validates against the schema with a general-purpose validator (Ajv, JSON Schema 2020-12)', () => {
  // ajv is CommonJS: its class is the module's default export, or the module itself, depending on the loader
  type AjvClass = new (options: { strict: boolean }) => { compile(schema: object): ((data: unknown) => boolean) & { errors?: unknown[] | null } };
  const module = Ajv2020 as unknown as AjvClass & { default?: AjvClass };
  const Ajv = module.default ?? module;
  const validate = new Ajv({ strict: false }).compile(scenarioSchema());
  const demos = readdirSync('scenarios').filter((f) => f.endsWith('.json') && !f.includes('schema'));
  expect(demos.length).toBeGreaterThanOrEqual(3);
  for (const file of demos) {
    const ok = validate(JSON.parse(readFileSync(`scenarios/${file}`, 'utf8')));
    expect(validate.errors ?? [], file).toEqual([]);
    expect(ok).toBe(true);
  }
  // and a typo is caught by the schema as by the loader
  expect(validate({ name: 'x', bank: [{ capacitence: 1 }], feed: {}, rails: {}, armature: {} })).toBe(false);
});
