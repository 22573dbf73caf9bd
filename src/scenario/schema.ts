/**
 * The JSON Schema of scenario files, generated from the same field table the loader reads, so editors
 * complete and check exactly what railpulse accepts.
 */
import { SCENARIO_FIELDS, type Field, type Range } from './fields.js';
import { rangeText } from './ranges.js';

type Schema = Record<string, unknown>;

const QUANTITY_PATTERN = '^\\s*[-+]?(\\d+\\.?\\d*|\\.\\d+)([eE][-+]?\\d+)?\\s*\\S.*$';

function fieldSchema(field: Field): Schema {
  switch (field.kind) {
    case 'quantity':
      return {
        description: `${field.description} — a number in SI (${field.dimension.display || 'dimensionless'}) or a string with a unit; plausible range ${rangeText(field)}`,
        anyOf: [{ type: 'number', ...bounds(field.range) }, { type: 'string', pattern: QUANTITY_PATTERN, maxLength: 100 }],
        ...(field.default !== undefined ? { default: field.default } : {}),
      };
    case 'integer':
      return { description: `${field.description}; ${rangeText(field)}`, type: 'integer', ...bounds(field.range), ...(field.default !== undefined ? { default: field.default } : {}) };
    case 'text':
      return { description: field.description, type: 'string', maxLength: field.maxLength };
    case 'raw':
      return { description: field.description, ...(field.schema ?? {}) };
    case 'list':
      return { description: field.description, type: 'array', minItems: 1, maxItems: field.maxItems, items: fieldSchema(field.item) };
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

/** A plausible range as JSON Schema bounds (plain numbers only: a string's unit is for railpulse to read). */
function bounds(range: Range): Schema {
  return { ...(range.minExclusive ? { exclusiveMinimum: range.min } : { minimum: range.min }), maximum: range.max };
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
