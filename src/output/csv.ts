/** Waveforms as CSV: one row per sample, SI units in the header. */
import type { Scenario } from '../scenario/types.js';
import type { Waveforms } from '../solve/types.js';
import { LOSS_KEYS } from '../solve/types.js';

export function waveformCsv(scenario: Scenario, w: Waveforms): string {
  const columns: [string, number[]][] = [
    ['t [s]', w.t],
    ['I [A]', w.current],
    ...scenario.bank.map((g, n): [string, number[]] => [`I ${csvName(g.label)} [A]`, w.groupCurrent[n]!]),
    ...scenario.bank.map((g, n): [string, number[]] => [`V ${csvName(g.label)} [V]`, w.groupVoltage[n]!]),
    ['V_breech [V]', w.breechVoltage],
    ['V_muzzle [V]', w.muzzleVoltage],
    ['x [m]', w.position],
    ['v [m/s]', w.velocity],
    ['a [m/s^2]', w.acceleration],
    ['F_em [N]', w.force],
    ['E_capacitors [J]', w.energy.capacitors],
    ['E_magnetic [J]', w.energy.magnetic],
    ['E_kinetic [J]', w.energy.kinetic],
    ...LOSS_KEYS.map((k): [string, number[]] => [`W_${k} [J]`, w.energy.losses[k]]),
    ['residual [J]', w.energy.residual],
  ];
  const lines = [columns.map(([name]) => name).join(',')];
  for (let row = 0; row < w.t.length; row++) {
    lines.push(columns.map(([, values]) => String(values[row])).join(','));
  }
  return lines.join('\n') + '\n';
}

function csvName(label: string): string {
  return label.replace(/[",\n\r\[\]]/g, ' ').trim();
}
