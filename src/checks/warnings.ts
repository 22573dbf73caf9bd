/**
 * Warnings a person deciding whether to fire must see, read off a shot (no physics recomputed).
 */
import { DEFAULT_LIMITS } from '../scenario/limits.js';
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { largest } from '../core/extrema.js';
import { formatNumber, formatPercent, formatQuantity } from '../units/format.js';

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
    const group = scenario.bank[g]!;
    const rated = group.ratedReversal ?? scenario.limits?.ratedReversal ?? DEFAULT_LIMITS.ratedReversal;
    // a crowbarred capacitor is clamped at the diode's small forward voltage: worth a warning only above the rating
    if (m.reversal > 0 && (!group.crowbar || m.reversal > rated)) {
      warnings.push({
        id: 'reversal',
        message: `${m.label}: capacitor voltage reverses to ${formatPercent(m.reversal)} of its ${formatQuantity(group.voltage, 'V')} charge (rated ${formatPercent(rated)})${m.reversal > rated ? ' — above the rating' : ''}`,
      });
    }
  });
  if (r.outcome === 'stalled') {
    warnings.push({ id: 'stalled', message: `the armature stalled in the bore at ${formatQuantity(r.finalPosition, 'm')} from the breech (rails ${formatQuantity(scenario.rails.length, 'm')})` });
  }
  if (r.outcome === 'timeout') {
    warnings.push({ id: 'timeout', message: `the shot reached the end time ${formatQuantity(scenario.solver.endTime, 's')} before exit or stall` });
  }
  const worst = shot.waveforms ? largest(shot.waveforms.energy.residual, Math.abs) : Math.abs(r.energy.residual);
  if (worst > LEDGER_TOLERANCE * r.energy.initial) {
    warnings.push({ id: 'ledger', message: `energy ledger residual ${formatNumber(worst / r.energy.initial)} of the stored energy exceeds ${formatNumber(LEDGER_TOLERANCE)}` });
  }
  return warnings;
}
