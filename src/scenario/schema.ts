/**
 * The JSON Schema of scenario files, generated from the same field table the loader reads, so editors
 * complete and check exactly what railpulse accepts.
 */
import { SCENARIO_FIELDS, type Field } from './fields.js';

type Schema = Record<string, unknown>;

const QUANTITY_PATTERN = '^\\s*[-+]?(\\d+\\.?\\d*|\\.\\d+)([eE][-+]?\\d+)?\\s*\\S.*$';

function fieldSchema(field: Field): Schema {
  switch (field.kind) {
    case 'quantity':
      return {
        description: `${field.description} — a number in SI (${field.dimension.display || 'dimensionless'}) or a string with a unit`,
        anyOf: [{ type: 'number' }, { type: 'string', pattern: QUANTITY_PATTERN }],
        ...(field.default !== undefined ? { default: field.default } : {}),
      };
    case 'integer':
      return { description: field.description, type: 'integer', minimum: 1, ...(field.default !== undefined ? { default: field.default } : {}) };
    case 'text':
      return { description: field.description, type: 'string' };
    case 'raw':
      return { description: field.description };
    case 'list':
      return { description: field.description, type: 'array', minItems: 1, items: fieldSchema(field.item) };
    case 'section': {
      const object: Schema = {
        description: field.description,
        type: 'object',
        additionalProperties: false,
        properties: Object.fromEntries(Object.entries(field.fields).map(([k, f]) => [k, fieldSchema(f)])),
        required: Object.entries(field.fields).filter(([, f]) => f.required).map(([k]) => k),
      };
      return field.optional ? { anyOf: [object, { type: 'null' }], description: field.description } : object;
    }
  }
}

export function scenarioSchema(): Schema {
  const root = fieldSchema({ kind: 'section', fields: SCENARIO_FIELDS, description: 'A railpulse shot scenario' });
  return {
    $schema: 'https://json-schema.org/draft/2020-12/schema',
    $id: 'railpulse.schema.json',
    title: 'railpulse scenario',
    ...root,
    // a launch needs rails and an armature; a ring-down into a shorted load has none of the launch keys
    if: { required: ['load'], properties: { load: { type: 'object' } } },
    then: { not: { anyOf: ['rails', 'armature', 'friction', 'drag', 'target'].map((key) => ({ required: [key] })) } },
    else: { required: ['rails', 'armature'] },
  };
}
