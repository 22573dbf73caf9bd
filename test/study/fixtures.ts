// Scenarios of our own invention for the study tests, read through the real loader.
import { fileURLToPath } from 'node:url';
import { loadScenarioFile } from '../../src/scenario/load.js';
import type { Scenario } from '../../src/scenario/types.js';

export const TWO_GROUP_FILE = fileURLToPath(new URL('./fixtures/two-group.json', import.meta.url));

export function twoGroupScenario(): Scenario {
  return loadScenarioFile(TWO_GROUP_FILE).scenario;
}
