/**
 * Model sampling for comparison with a measurement: sample at least as finely as the scope did (but no
 * finer than 1/4000 of the record) so that interpolating the model at the measured times adds no error
 * worth mentioning. The fit (./fit.ts) and the overlay of a shot not fitted use the same rule.
 */
import type { Scenario } from '../scenario/types.js';
import type { Measurement } from './csv.js';
import { medianInterval } from './waveform.js';

export function sampledLikeMeasurement(scenario: Scenario, measurement: Measurement | undefined): Scenario {
  if (!measurement || measurement.t.length < 2) return scenario;
  const span = measurement.t[measurement.t.length - 1]! - measurement.t[0]!;
  const target = Math.max(medianInterval(measurement.t), span / 4000);
  const current = scenario.solver.sampleInterval;
  if (current > 0 && current <= target) return scenario;
  return { ...scenario, solver: { ...scenario.solver, sampleInterval: target } };
}
