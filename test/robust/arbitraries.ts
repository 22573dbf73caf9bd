/**
 * Generated scenarios for the fuzz test: realistic ones (log-uniform over engineering ranges, each a shot that
 * must close its ledger), hostile values over and beyond the plausible ranges, and corruptions of a valid file's
 * text. Inputs only; the properties are in fuzz.test.ts.
 */
import fc from 'fast-check';

type Json = Record<string, unknown>;

/** log-uniform between lo and hi, as a plain SI number or a string with a unit when `unit` is given */
const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

const group = fc.record({
  count: fc.integer({ min: 1, max: 8 }),
  capacitance: logUniform(20e-6, 5e-3),
  voltage: logUniform(500, 20e3),
  esr: logUniform(1e-4, 2e-2),
  inductance: logUniform(0.5e-6, 50e-6),
  resistance: logUniform(1e-4, 1e-2),
  trigger: fc.oneof(fc.constant(0), logUniform(1e-6, 500e-6)),
  crowbar: fc.option(fc.record({ drop: logUniform(1, 100), resistance: logUniform(1e-4, 1e-2) }), { nil: null }),
});

/** A scenario a lab could mean: every shot of these must finish and close its ledger. */
export const realisticScenario: fc.Arbitrary<Json> = fc
  .record({
    bank: fc.array(group, { minLength: 1, maxLength: 4 }),
    feed: fc.record({ inductance: logUniform(0.05e-6, 2e-6), resistance: logUniform(1e-5, 5e-3) }),
    rails: fc.record({ length: logUniform(0.2, 5), inductanceGradient: logUniform(0.2e-6, 1e-6), resistanceGradient: logUniform(1e-5, 1e-3) }),
    armature: fc.record({ mass: logUniform(1e-3, 0.5), position: logUniform(1e-3, 0.05), resistance: logUniform(1e-6, 1e-3), contactResistance: logUniform(1e-6, 1e-3), arcDrop: fc.oneof(fc.constant(0), logUniform(1, 200)) }),
    friction: fc.option(
      fc.record({ coefficient: fc.double({ min: 0, max: 0.4, noNaN: true }), extra: fc.double({ min: 0, max: 0.2, noNaN: true }), preload: logUniform(1, 1000), magneticLoading: logUniform(1e-10, 1e-7) }).map(({ extra, ...f }) => ({ ...f, staticCoefficient: f.coefficient + extra })),
      { nil: undefined },
    ),
    drag: fc.option(fc.record({ gasDensity: logUniform(0.1, 2), dragCoefficient: logUniform(0.1, 2), boreArea: logUniform(1e-5, 1e-3) }), { nil: undefined }),
  })
  .map((s) => {
    const scenario: Json = { name: 'fuzz', bank: s.bank, feed: s.feed, rails: s.rails, armature: s.armature, solver: { endTime: 0.02, maxSteps: 200_000 } };
    if (s.friction) scenario.friction = s.friction;
    if (s.drag) scenario.drag = s.drag;
    return scenario;
  });

/** Every value a JSON file can hold where a quantity goes, from sensible to absurd. */
const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.double(), // includes ±0, tiny, huge; NaN/∞ become null in JSON
  fc.constantFrom(1e308, -1e308, 5e-324, 1e-300, 0, -0, 1e200, 1e15, 1e-15),
  fc.constantFrom('1e200 V', '1e308 F', '-5 uF', '10 s', '1e999 m', 'NaN V', 'Infinity', '0x10 V', '1/0 H', '((((1)))) kg', '450 uF uF', '', ' ', '\u0000', '12 kV'.repeat(40)),
  fc.string({ maxLength: 30 }),
  fc.constantFrom(null, true, false, [], {}, [1], { value: 1 }),
  fc.integer({ min: -1e9, max: 1e9 }),
);

/** Scenario paths where a hostile value goes (and keys that are not there at all, prototype-like ones included). */
const hostilePath = fc.constantFrom(
  ['bank', 0, 'capacitance'], ['bank', 0, 'voltage'], ['bank', 0, 'inductance'], ['bank', 0, 'count'], ['bank', 0, 'trigger'], ['bank', 0, 'esr'],
  ['bank', 0, 'crowbar'], ['bank', 0, 'crowbar', 'drop'], ['bank', 0, 'label'], ['bank'], ['bank', 0],
  ['feed', 'inductance'], ['feed', 'resistance'], ['rails', 'length'], ['rails', 'inductanceGradient'], ['rails', 'resistanceGradient'],
  ['rails', 'material'], ['rails', 'geometry'], ['rails', 'geometry', 'height'], ['armature', 'mass'], ['armature', 'position'], ['armature', 'arcDrop'],
  ['armature', 'material'], ['friction', 'coefficient'], ['friction', 'staticCoefficient'], ['friction', 'preload'], ['drag', 'gasDensity'],
  ['solver', 'endTime'], ['solver', 'sampleInterval'], ['solver', 'relTol'], ['solver', 'maxSteps'], ['solver', 'currentFloor'],
  ['name'], ['description'], ['materials'], ['materials', 'constructor'], ['materials', '__proto__'], ['limits'], ['limits', 'constructor'],
  ['limits', 'peakAcceleration'], ['constructor'], ['__proto__'], ['toString'], ['bank', 0, '__proto__'], ['feed', 'hasOwnProperty'],
);

function setDeep(root: Json, path: readonly (string | number)[], value: unknown): void {
  let node: Record<string | number, unknown> = root;
  for (let k = 0; k < path.length - 1; k++) {
    const step = path[k]!;
    const next = Object.hasOwn(node, step) ? node[step] : undefined;
    if (typeof next !== 'object' || next === null) Object.defineProperty(node, step, { value: {}, enumerable: true, writable: true, configurable: true });
    node = node[step] as Record<string | number, unknown>;
  }
  Object.defineProperty(node, path[path.length - 1]!, { value, enumerable: true, writable: true, configurable: true });
}

/** A realistic scenario with one to three values replaced by hostile ones, as JSON text. */
export const hostileScenarioText: fc.Arbitrary<string> = fc
  .tuple(realisticScenario, fc.array(fc.tuple(hostilePath, hostileValue), { minLength: 1, maxLength: 3 }))
  .map(([scenario, edits]) => {
    const copy = structuredClone(scenario);
    // hostile shots must fail fast, not run to a million steps
    (copy.solver as Json).maxSteps = 20_000;
    for (const [path, value] of edits) setDeep(copy, path, value);
    return JSON.stringify(copy);
  });

/** Corruptions of a valid file's text: what editors, disks and hurried people do to JSON. */
export const corruptedText: fc.Arbitrary<string> = fc
  .tuple(realisticScenario.map((s) => JSON.stringify(s, null, 2)), fc.integer({ min: 0, max: 1_000_000 }), fc.nat(), fc.string({ maxLength: 8 }))
  .chain(([text, at, n, insert]) => {
    const p = at % (text.length + 1);
    return fc.constantFrom(
      text.slice(0, p), // truncated
      text.slice(0, p) + text.slice(p + 1 + (n % 5)), // bytes dropped
      text.slice(0, p) + insert + text.slice(p), // garbage inserted
      `\uFEFF${text}`, // byte-order mark
      `\uFEFF${text.slice(0, p)}`,
      text.replace(/"/g, "'"), // single quotes
      text.replace(/,\n/, ',,\n'),
      `${'['.repeat(1000 + (n % 100_000))}`, // deep nesting, unterminated
      `${'['.repeat(70)}${']'.repeat(70)}`, // deep nesting, valid JSON
      text.replace('"bank"', `"bank": ${'['.repeat(80)}1${']'.repeat(80)}, "x"`),
      text.replace('"name": "fuzz"', `"name": "${'x'.repeat(200 + (n % 20_000))}"`),
      text.replace('"feed"', '"__proto__": {"inductance": 1}, "feed"'),
      text.replace('"feed"', '"constructor": 1, "feed"'),
      text.replace(/"inductance": [^,}\n]+/, '"inductance": "1e-300 H"'),
      text.replace(/\d/, '\u0000'),
      `${text}\n${text}`,
      '',
      'null',
      '[]',
      '"scenario"',
      '{}',
    );
  });
