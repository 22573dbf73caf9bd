/**
 * Warnings a person deciding whether to fire must see, read off a shot (no physics recomputed).
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { largest } from '../core/extrema.js';

export interface ShotWarning {
  id: 'reversal' | 'stalled' | 'timeout' | 'ledger';
  message: string;
}

/** Ledger tolerance of the model contract: |residual| ≤ 1e-6 E0. */
export const LEDGER_TOLERANCE = 1e-6;

export function shotWarnings(scenario: Scenario, shot: Shot): ShotWarning[] {
  const r = shot.results;
  const warnings: ShotWarning[] = [];
  r.modules.forEach((m, g) => {
    if (m.reversal > 0) {
      const group = scenario.bank[g]!;
      const rated = group.ratedReversal ?? scenario.limits?.ratedReversal ?? 0.2;
      warnings.push({
        id: 'reversal',
        message: `${m.label}: capacitor voltage reverses to ${(m.reversal * 100).toFixed(1)} % of its ${(group.voltage / 1e3).toFixed(2)} kV charge (rated ${(rated * 100).toFixed(0)} %)${m.reversal > rated ? ' — above the rating' : ''}`,
      });
    }
  });
  if (r.outcome === 'stalled') {
    warnings.push({ id: 'stalled', message: `the armature stalled in the bore at ${(r.finalPosition * 100).toFixed(1)} cm (rails ${(scenario.rails.length * 100).toFixed(1)} cm)` });
  }
  if (r.outcome === 'timeout') {
    warnings.push({ id: 'timeout', message: `the shot reached the end time ${(scenario.solver.endTime * 1e3).toFixed(3)} ms before exit or stall` });
  }
  const worst = shot.waveforms ? largest(shot.waveforms.energy.residual, Math.abs) : Math.abs(r.energy.residual);
  if (worst > LEDGER_TOLERANCE * r.energy.initial) {
    warnings.push({ id: 'ledger', message: `energy ledger residual ${(worst / r.energy.initial).toExponential(2)} of the stored energy exceeds ${LEDGER_TOLERANCE}` });
  }
  return warnings;
}
