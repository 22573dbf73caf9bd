/**
 * The compact terminal summary of a shot: a safety line first, then the status (the worst of the checks and the
 * warnings, as on the record), the figures, the energy budget, the checks and the warnings. Every number goes
 * through the one formatter (src/units/format.ts).
 */
import type { Assessment } from '../checks/assess.js';
import { bankHazard, HAZARD_CLASS_NAMES } from '../checks/hazard.js';
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { LOSS_KEYS } from '../solve/types.js';
import { formatCount, formatExact, formatNumber, formatPercent, formatQuantity, forTerminal, GN, STANDARD_GRAVITY } from '../units/format.js';
import { checkFigures, DIRECTION_SYMBOL, statusSentence, verdictLabel } from './verdicts.js';

const OUTCOME_LINE = {
  exited: 'armature exits the muzzle',
  stalled: 'armature STALLED in the bore',
  timeout: 'TIMED OUT in the bore',
  discharged: 'bank discharged into the short (ring-down)',
} as const;

/** The safety line that opens the summary: what is stored, at what voltage, in which hazard class. */
export function safetyLine(scenario: Scenario): string {
  const hazard = bankHazard(scenario.bank, scenario.limits);
  const names = hazard.classes.map((c) => HAZARD_CLASS_NAMES[c]);
  const classes = names.length ? `DOE-HDBK-1092 ${names.join(' and ')} class${names.length > 1 ? 'es' : ''}` : 'below the DOE-HDBK-1092 hazard thresholds';
  return (
    `SAFETY: this bank stores ${formatQuantity(hazard.storedEnergy, 'J')} at up to ${formatQuantity(hazard.maxChargeVoltage, 'V')} (${classes}). ` +
    'This is a model, not a licence to fire: discharge, short and ground the bank before any work; local codes and your institution\'s rules decide.'
  );
}

export function shotSummary(scenario: Scenario, shot: Shot, assessment: Assessment): string {
  const r = shot.results;
  const e = r.energy;
  const lines: string[] = [];
  const row = (label: string, value: string) => lines.push(`  ${label.padEnd(28)} ${value}`);
  lines.push(safetyLine(scenario));
  lines.push(`${scenario.name} — ${OUTCOME_LINE[r.outcome]}`);
  if (scenario.record) {
    const { shotId, operator, reviewer } = scenario.record;
    const parts = [shotId ? `shot ${shotId}` : '', operator ? `operator ${operator}` : '', reviewer ? `reviewer ${reviewer}` : ''].filter(Boolean);
    if (parts.length) lines.push(`  ${parts.join(', ')}`);
  }
  lines.push(`STATUS: ${assessment.status.verdict.toUpperCase()} — ${statusSentence(assessment.status)}`);
  const launch = !scenario.load;
  if (launch) {
    row('muzzle velocity', r.outcome === 'exited' ? formatQuantity(r.muzzleVelocity, 'm/s') : `${formatQuantity(r.muzzleVelocity, 'm/s')} (final; did not exit)`);
    row('exit time', r.exitTime === null ? '—' : formatQuantity(r.exitTime, 's'));
    row('final position', formatQuantity(r.finalPosition, 'm'));
  }
  row('peak current', `${formatQuantity(r.peakCurrent, 'A')} at ${formatQuantity(r.peakCurrentTime, 's')}`);
  if (launch) row('peak acceleration', `${formatQuantity(r.peakAcceleration, 'm/s²')} (${formatQuantity(r.peakAcceleration / STANDARD_GRAVITY, GN)})`);
  row(launch ? 'peak breech voltage' : 'peak voltage across short', formatQuantity(r.peakBreechVoltage, 'V'));
  row('action integral', formatQuantity(r.actionIntegral, 'A²·s'));
  if (r.armatureTemperature !== undefined) row('armature temperature', `${formatQuantity(r.armatureTemperature, '°C')} at the end (adiabatic heating; its resistance rose with it)`);
  if (r.railTemperature !== undefined) row('rail surface temperature', `${formatQuantity(r.railTemperature, '°C')} at the breech (adiabatic heating of the current layer)`);
  if (r.transitionTime !== undefined) row('contact turns into an arc', `at ${formatQuantity(r.transitionTime, 's')}, ${formatQuantity(r.transitionPosition!, 'm')} from the breech`);
  else if (scenario.armature.transition) row('contact turns into an arc', 'no (the contact action stays below armature.transition)');
  if (launch) row('efficiency', formatPercent(r.efficiency));
  scenario.bank.forEach((group, i) => {
    const m = r.modules[i];
    if (!m) return;
    row(`group ${m.label}`, `${formatCount(group.count, 'module')}; peak ${formatQuantity(m.peakCurrent, 'A')} per module, reversal ${formatPercent(m.reversal)}`);
  });
  lines.push(launch ? '  energy at the end of the in-bore phase:' : '  energy at the end of the ring-down:');
  const share = (value: number) => `${formatQuantity(value, 'J').padStart(11)}  ${formatPercent(value / e.initial).padStart(9)}`;
  row('  stored (E0)', share(e.initial));
  if (launch) row('  kinetic', share(e.kinetic));
  row('  left in capacitors', share(e.capacitors));
  if (launch) {
    row('  magnetic (feed + rails)', `${share(e.magneticRails)}  (the muzzle arc must absorb this)`);
    if (e.railInterior !== undefined) row('  magnetic (inside the rails)', `${share(e.railInterior)}  (current still diffusing into the rails)`);
    row('  magnetic (module coils)', `${share(e.magnetic - e.magneticRails - (e.railInterior ?? 0))}  (shared by the arc and module resistances)`);
  }
  if (e.afterExit !== undefined) row('  after exit (arc bound)', `${share(e.afterExit)}  (all magnetic energy and the capacitors still conducting or armed: the muzzle arc gets at most this)`);
  // in a ring-down the short stands in the armature's place, and so does its loss
  for (const key of LOSS_KEYS) if (e.losses[key] !== 0) row(`  loss: ${!launch && key === 'armature' ? 'short (load)' : key}`, share(e.losses[key]));
  row('  ledger residual', `${formatNumber(e.residual / e.initial)} of E0`);
  const derived = scenario.rails.derived;
  if (derived) {
    lines.push('  rails from geometry:');
    row("  L' high-frequency", `${formatQuantity(derived.inductanceGradientHighFrequency, 'H/m')} (field solution, estimated error ${formatPercent(derived.estimatedRelativeError)})`);
    row("  L' uniform current", `${formatQuantity(derived.inductanceGradientUniform, 'H/m')} (geometric mean distances)`);
    row("  L' used", formatQuantity(scenario.rails.inductanceGradient, 'H/m'));
    const rails = assessment.railsDerived;
    if (scenario.rails.diffusion) {
      row("  R' uniform current", `${formatQuantity(scenario.rails.resistanceGradient, 'Ω/m')} (the floor)`);
      if (rails?.resistanceGradientLossEquivalent != null) {
        row("  R' loss-equivalent", `${formatQuantity(rails.resistanceGradientLossEquivalent, 'Ω/m')} (current diffusing into each rail section from when the armature passes it)`);
      }
    } else {
      row("  R' used", formatQuantity(scenario.rails.resistanceGradient, 'Ω/m'));
    }
  }
  if (assessment.checks.length > 0) {
    lines.push('engineering checks (advice, not certification; sources in --json and the record):');
    for (const c of assessment.checks) {
      const figures = checkFigures(c);
      const label = verdictLabel(c).toUpperCase();
      const limit = c.limit === null ? ' (no limit given)' : ` (${c.direction ? `limit ${DIRECTION_SYMBOL[c.direction]} ` : 'class from '}${figures.limit.replace(/^(\u2264|\u2265|class from)\u00A0/, '')}${figures.warnAt ? `, warns from ${figures.warnAt}` : ''})`;
      lines.push(`  ${label.padEnd(15)} ${c.title}: ${figures.value}${limit}`);
    }
  }
  if (assessment.warnings.length > 0) {
    lines.push('warnings:');
    for (const w of assessment.warnings) lines.push(`  ! ${w.message}`);
  }
  lines.push(
    'before any work on the bank: disconnect the charger, discharge through the dump resistors, short and ground every capacitor and keep the shorts on; ' +
      'the full procedures and the discharge rule railpulse cites (NFPA 70, 2023 edition, Article 460, from memory) close the shot record; local codes and your institution\'s rules decide.',
  );
  lines.push(`(${shot.stats.steps} steps, ${shot.stats.rhsEvaluations} evaluations, relative tolerance ${formatExact(shot.stats.relTol, '')})`);
  return forTerminal(lines.join('\n')) + '\n';
}
