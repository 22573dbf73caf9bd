/**
 * Warnings that follow directly from a shot's results (no physics is recomputed here). The report
 * renders these together with any warnings the caller passes; the caller may use this function to
 * compute its own list, in which case identical strings appear once.
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import { formatPercent, formatQuantity, formatScientific } from './format.js';

/** The energy ledger must close to this fraction of E0 (model contract §4). */
export const LEDGER_RESIDUAL_LIMIT = 1e-6;

export function shotWarnings(results: ShotResults, scenario: Scenario): string[] {
  const warnings: string[] = [];
  results.modules.forEach((module, index) => {
    if (!(module.reversal > 0)) return;
    const rated = scenario.bank[index]?.ratedReversal;
    if (rated !== undefined && module.reversal <= rated) return;
    const rating =
      rated !== undefined
        ? `, above its rated ${formatPercent(rated)}`
        : ' (pulse capacitors are commonly rated for 10–20 %; check the datasheet)';
    warnings.push(
      `Capacitor voltage reversal in "${module.label}": the voltage swings to −${formatPercent(module.reversal)} of the charge voltage${rating}.`,
    );
  });
  if (results.outcome === 'stalled') {
    warnings.push(
      `The armature stalled in the bore at ${formatQuantity(results.finalPosition, 'm')} and did not leave the muzzle; the velocity shown is its final velocity.`,
    );
  }
  if (results.outcome === 'timeout') {
    warnings.push(
      'The shot reached the configured end time before the armature left the muzzle or stalled; figures are at the end time. Raise solver.endTime.',
    );
  }
  const initial = results.energy.initial;
  const residual = results.energy.residual;
  if (initial > 0 && Math.abs(residual) > LEDGER_RESIDUAL_LIMIT * initial) {
    warnings.push(
      `The energy ledger does not close: residual ${formatQuantity(residual, 'J')} = ${formatScientific(Math.abs(residual) / initial, '', 2)} of E0 (limit 1 × 10⁻⁶). Treat the figures as suspect; tighten solver.relTol.`,
    );
  }
  return warnings;
}
