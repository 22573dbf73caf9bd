/**
 * The safety block of a shot report. The stored energy is a plain sum over the bank as configured
 * (Σ ½·n·C·V0²); the cautions are the usual ones of the trade and defer to local rules.
 */
import type { Scenario } from '../scenario/types.js';
import { escapeHtml } from './escape.js';
import { formatQuantity } from './format.js';

export interface BankEnergy {
  label: string;
  count: number;
  capacitance: number;
  voltage: number;
  /** ½·n·C·V0² (J) */
  energy: number;
}

export function bankEnergies(scenario: Scenario): BankEnergy[] {
  return scenario.bank.map((group) => ({
    label: group.label,
    count: group.count,
    capacitance: group.capacitance,
    voltage: group.voltage,
    energy: 0.5 * group.count * group.capacitance * group.voltage ** 2,
  }));
}

/** Capacitor hazard thresholds [published: DOE-HDBK-1092, capacitor hazard classes]. */
function hazardSentence(totalEnergy: number, maxVoltage: number): string {
  const shock = maxVoltage >= 100 && totalEnergy >= 10;
  const arcFlash = maxVoltage >= 100 && totalEnergy >= 10e3;
  if (arcFlash) {
    return 'At 100 V or more and 10 kJ or more stored, this bank is both a shock hazard and an arc-flash hazard in the capacitor hazard classes of DOE-HDBK-1092.';
  }
  if (shock) {
    return 'At 100 V or more and 10 J or more stored, this bank is a shock hazard in the capacitor hazard classes of DOE-HDBK-1092.';
  }
  return 'Even below the shock-hazard thresholds of DOE-HDBK-1092 (100 V and 10 J), a shorted bank can burn and throw molten metal.';
}

export function safetySection(scenario: Scenario): string {
  const groups = bankEnergies(scenario);
  const total = groups.reduce((sum, g) => sum + g.energy, 0);
  const maxVoltage = groups.reduce((max, g) => Math.max(max, g.voltage), 0);
  const rows = groups
    .map(
      (g) =>
        `<tr><td>${escapeHtml(g.label)}</td><td class="num">${g.count}</td><td class="num">${formatQuantity(g.capacitance, 'F')}</td>` +
        `<td class="num">${formatQuantity(g.voltage, 'V')}</td><td class="num">${formatQuantity(g.energy, 'J')}</td></tr>`,
    )
    .join('');
  return `<section class="safety" id="safety" aria-labelledby="safety-title">
<h2 id="safety-title">Safety: this bank stores lethal energy</h2>
<p class="lead"><strong>A charged capacitor bank can kill.</strong> As configured, this bank stores
<strong data-figure="storedEnergy" data-si="${total}">${formatQuantity(total, 'J')}</strong> (Σ ½·n·C·V0²) at charge voltages up to
<strong data-figure="maxChargeVoltage" data-si="${maxVoltage}">${formatQuantity(maxVoltage, 'V')}</strong>. ${hazardSentence(total, maxVoltage)}</p>
<table><thead><tr><th>Group</th><th class="num">Modules n</th><th class="num">C per module</th><th class="num">V0</th><th class="num">½·n·C·V0²</th></tr></thead><tbody>${rows}</tbody></table>
<ul>
<li><strong>Before anyone reaches into the bank, the feed, the rails or the armature:</strong> switch off and lock out the charger, discharge every group through its dump resistor, then short and ground every capacitor terminal with a grounding stick and leave shorting straps in place while working. Through a resistor R the voltage falls from V0 to V in R·C·ln(V0/V); a bleeder resistor alone is no proof of a safe bank.</li>
<li>Capacitors over 600 V are to be discharged to 50 V or less within 5 minutes of disconnection, and shorted and grounded before work (e.g. NEC Article 460; Cal/OSHA Title 8 §2893). A capacitor recovers voltage after its short is removed (dielectric absorption): keep it shorted while not in use.</li>
<li>Interlocks on every enclosure door that dump the bank when opened; a fail-safe dump on loss of power; a charge-voltage indicator readable from the firing position; one key for charge and fire, held by the operator.</li>
<li>Personal protection as your rules require (arc-rated face shield and clothing, hearing protection, eye protection); a catch box and a cleared line of fire — the armature, the muzzle arc and debris leave at high speed.</li>
</ul>
<p><strong>These figures come from a model. They are not a licence to build, charge or fire anything.</strong> Follow local electrical codes, your institution's high-voltage safety rules and licensed practice, and have the design and the procedures reviewed by whoever is responsible for high-voltage safety where you work.</p>
</section>`;
}
