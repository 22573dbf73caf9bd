/**
 * Read and replace one number in a Scenario by its path (`bank[0].esr`, `feed.inductance`), the way the fit
 * names its free parameters. A stand-in until the lead's src/scenario/paths.ts lands; the fit takes the
 * setter by injection, so swapping it is one line in the CLI.
 */
import { InputError } from '../scenario/errors.js';
import type { Scenario } from '../scenario/types.js';

type Key = string | number;

/** `bank[0].esr` → ['bank', 0, 'esr'] */
export function parseScenarioPath(path: string): Key[] {
  const keys: Key[] = [];
  for (const part of path.split('.')) {
    const match = /^([A-Za-z_][A-Za-z0-9_]*)((?:\[\d+\])*)$/.exec(part);
    if (!match) throw new InputError(path, 'expected a parameter path like bank[0].esr or feed.inductance');
    keys.push(match[1]!);
    for (const index of match[2]!.matchAll(/\[(\d+)\]/g)) keys.push(Number(index[1]));
  }
  return keys;
}

export function getScenarioPath(scenario: Scenario, path: string): number {
  let node: unknown = scenario;
  for (const key of parseScenarioPath(path)) {
    if (node === null || typeof node !== 'object' || !(key in node)) throw new InputError(path, 'no such parameter in the scenario');
    node = (node as Record<Key, unknown>)[key];
  }
  if (typeof node !== 'number') throw new InputError(path, 'is not a number in the scenario, so it cannot be fitted');
  return node;
}

/** A new Scenario with one number replaced; the input is not modified. */
export function setScenarioPath(scenario: Scenario, path: string, value: number): Scenario {
  getScenarioPath(scenario, path); // same checks and messages as reading
  const keys = parseScenarioPath(path);
  const replace = (node: unknown, depth: number): unknown => {
    if (depth === keys.length) return value;
    const key = keys[depth]!;
    if (Array.isArray(node)) return node.map((item, i) => (i === key ? replace(item, depth + 1) : item));
    const record = node as Record<Key, unknown>;
    return { ...record, [key]: replace(record[key], depth + 1) };
  };
  return replace(scenario, 0) as Scenario;
}
