/** The compact terminal summary of a shot. */
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { LOSS_KEYS } from '../solve/types.js';
import type { ShotWarning } from '../checks/warnings.js';
import { formatPercent, formatSI, STANDARD_GRAVITY } from '../units/format.js';
import type { Check } from '../checks/engineering.js';

function formatValue(value: number, unit: string): string {
  if (unit === '' || unit === '1') return formatPercent(value);
  if (unit === '%') return `${value.toPrecision(3)} %`;
  if (/^[A-JL-Za-zΩ]+$/.test(unit)) return formatSI(value, unit);
  return `${value.toPrecision(3)} ${unit}`;
}

export function shotSummary(scenario: Scenario, shot: Shot, warnings: ShotWarning[], checks: Check[] = []): string {
  const r = shot.results;
  const e = r.energy;
  const lines: string[] = [];
  const row = (label: string, value: string) => lines.push(`  ${label.padEnd(26)} ${value}`);
  const headline = { exited: 'armature exits the muzzle', stalled: 'armature STALLED in the bore', timeout: 'TIMED OUT', discharged: 'bank discharged into the short (ring-down)' };
  lines.push(`${scenario.name} — ${headline[r.outcome]}`);
  if (!scenario.load) {
    row('muzzle velocity', r.outcome === 'exited' ? formatSI(r.muzzleVelocity, 'm/s') : `${formatSI(r.muzzleVelocity, 'm/s')} (final; did not exit)`);
    row('exit time', r.exitTime === null ? '—' : formatSI(r.exitTime, 's'));
    row('final position', formatSI(r.finalPosition, 'm'));
  }
  row('peak current', `${formatSI(r.peakCurrent, 'A')} at ${formatSI(r.peakCurrentTime, 's')}`);
  if (!scenario.load) row('peak acceleration', `${formatSI(r.peakAcceleration, 'm/s²')} (${(r.peakAcceleration / STANDARD_GRAVITY).toPrecision(3)} g)`);
  row(scenario.load ? 'peak voltage across short' : 'peak breech voltage', formatSI(r.peakBreechVoltage, 'V'));
  row('action integral', `${r.actionIntegral.toPrecision(3)} A²s`);
  if (!scenario.load) row('efficiency', formatPercent(r.efficiency));
  for (const m of r.modules) {
    row(`module ${m.label}`, `peak ${formatSI(m.peakCurrent, 'A')} per module, reversal ${formatPercent(m.reversal)}`);
  }
  lines.push('  energy at the end of the in-bore phase:');
  const share = (value: number) => `${formatSI(value, 'J').padStart(10)}  ${formatPercent(value / e.initial).padStart(8)}`;
  row('  stored (E0)', share(e.initial));
  if (!scenario.load) row('  kinetic', share(e.kinetic));
  row('  left in capacitors', share(e.capacitors));
  if (!scenario.load) {
    row('  magnetic (feed + rails)', `${share(e.magneticRails)}  (the muzzle arc must absorb this)`);
    row('  magnetic (module coils)', `${share(e.magnetic - e.magneticRails)}  (shared by the arc and module resistances)`);
  }
  // in a ring-down the short stands in the armature's place, and so does its loss
  for (const key of LOSS_KEYS) if (e.losses[key] !== 0) row(`  loss: ${scenario.load && key === 'armature' ? 'short (load)' : key}`, share(e.losses[key]));
  row('  ledger residual', `${(e.residual / e.initial).toExponential(2)} of E0`);
  const derived = scenario.rails.derived;
  if (derived) {
    lines.push('  rails from geometry:');
    row("  L' high-frequency", `${(derived.inductanceGradientHighFrequency * 1e6).toFixed(4)} µH/m (field solution, est. error ${derived.estimatedRelativeError.toExponential(1)})`);
    row("  L' uniform current", `${(derived.inductanceGradientUniform * 1e6).toFixed(4)} µH/m (geometric mean distances)`);
    row("  L' used", `${(scenario.rails.inductanceGradient * 1e6).toFixed(4)} µH/m`);
    row("  R' used", formatSI(scenario.rails.resistanceGradient, 'Ω/m'));
  }
  if (checks.length > 0) {
    lines.push('engineering checks (advice, not certification; sources in --json and the report):');
    for (const c of checks) {
      const limit = c.limit === null ? '' : ` (limit ${formatValue(c.limit, c.unit)})`;
      lines.push(`  ${c.verdict.toUpperCase().padEnd(4)} ${c.title}: ${formatValue(c.value, c.unit)}${limit}`);
    }
  }
  if (warnings.length > 0) {
    lines.push('warnings:');
    for (const w of warnings) lines.push(`  ! ${w.message}`);
  }
  lines.push(`(${shot.stats.steps} steps, ${shot.stats.rhsEvaluations} evaluations, relTol ${shot.stats.relTol})`);
  return lines.join('\n') + '\n';
}
