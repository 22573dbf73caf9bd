/**
 * Model sampling for comparison with a measurement: sample at least as finely as the scope did (but no
 * finer than 1/4000 of the record) so that interpolating the model at the measured times adds no error
 * worth mentioning. The same rule the fit applies (./fit.ts), for the overlay of a shot not fitted.
 */
import type { Scenario } from '../scenario/types.js';
import type { Measurement } from './csv.js';
import { median } from './waveform.js';

export function sampledLikeMeasurement(scenario: Scenario, measurement: Measurement | undefined): Scenario {
  if (!measurement || measurement.t.length < 2) return scenario;
  const steps = measurement.t.slice(1).map((t, i) => t - measurement.t[i]!);
  const span = measurement.t.at(-1)! - measurement.t[0]!;
  const target = Math.max(median(steps), span / 4000);
  const current = scenario.solver.sampleInterval;
  if (current > 0 && current <= target) return scenario;
  return { ...scenario, solver: { ...scenario.solver, sampleInterval: target } };
}
