/** Report inputs for the tests: provenance with a fixed date and the synthetic multi-group shot. */
import type { ReportProvenance, ShotReportInput } from '../../src/report/html.js';
import { syntheticScenario, syntheticScenarioRaw, syntheticShot, type SyntheticOptions } from './fixtures/synthetic-shot.js';

export function fixedProvenance(date = '2026-12-02T10:00:00.000Z'): ReportProvenance {
  return {
    toolVersion: '0.1.0',
    nodeVersion: 'v20.20.2',
    date,
    scenarioSha256: '1a2b3c4d'.repeat(8),
    relTol: 1e-9,
    steps: 1234,
    rhsEvaluations: 45678,
  };
}

export function syntheticReportInput(options: SyntheticOptions & { samples?: number } = {}): ShotReportInput {
  const scenario = syntheticScenario(options);
  return {
    scenarioRaw: syntheticScenarioRaw(scenario),
    scenario,
    shot: syntheticShot(scenario, options.samples ?? 10_000),
    provenance: fixedProvenance(),
    warnings: [],
  };
}
