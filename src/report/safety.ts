/**
 * Safety on every page railpulse writes: a short banner at the top (stored energy, highest charge voltage, hazard
 * class, "a model, not a licence to fire") and the full procedures at the end. The figures come from bankHazard
 * (src/checks/hazard.ts), the same the hazard checks and the terminal summary read; the cautions are the usual ones
 * of the trade and defer to local codes, the institution's rules and licensed practice.
 */
import { DISCHARGE_RULE, HAZARD_CLASS_NAMES, type BankHazard, type HazardClass } from '../checks/hazard.js';
import { formatCount, formatQuantity } from '../units/format.js';
import { escapeHtml } from './escape.js';

/** One bank the page is about: a shot's scenario, a scenario of a comparison, a record of the archive. */
export interface BankOnPage {
  hazard: BankHazard;
  /** per group, when the page has the scenario in SI */
  groups?: ReadonlyArray<{ label: string; count: number; capacitance: number; voltage: number }>;
  /** the name the page gives this bank (comparison, archive) */
  name?: string;
}

function classesText(classes: readonly HazardClass[]): string {
  if (classes.length === 0) return 'below the DOE-HDBK-1092 capacitor hazard thresholds';
  const names = classes.map((c) => HAZARD_CLASS_NAMES[c]);
  return `DOE-HDBK-1092 ${names.join(' and ')} class${names.length > 1 ? 'es' : ''}`;
}

/** The classes met by any of the banks, in a fixed order. */
function anyClasses(banks: readonly BankOnPage[]): HazardClass[] {
  const order: HazardClass[] = ['shock', 'thermal', 'arc-flash'];
  return order.filter((c) => banks.some((b) => b.hazard.classes.includes(c)));
}

/**
 * The short banner for the top of a page. One bank: its figures; several: the largest stored energy and the highest
 * charge voltage among them (`scope` says what they are: "these shots", "the points of this study").
 */
export function safetyBanner(banks: readonly BankOnPage[], scope = 'this bank'): string {
  if (banks.length === 0) {
    return `<section id="safety-banner" class="safety-banner" role="note" aria-label="Safety"><p><strong>Danger: charged capacitor banks store lethal energy.</strong> These are model results, not a licence to fire. Full procedures at the end of this page.</p></section>`;
  }
  const stored = Math.max(...banks.map((b) => b.hazard.storedEnergy));
  const volts = Math.max(...banks.map((b) => b.hazard.maxChargeVoltage));
  const classes = anyClasses(banks);
  const upTo = banks.length > 1 ? 'up to ' : '';
  return `<section id="safety-banner" class="safety-banner" role="note" aria-label="Safety" data-classes="${classes.join(' ')}">
<p><strong>Danger: lethal stored energy.</strong> ${escapeHtml(scope === 'this bank' ? 'This bank stores' : `${scope[0]!.toUpperCase()}${scope.slice(1)} store`)} ${upTo}<strong data-figure="storedEnergy" data-si="${stored}">${formatQuantity(stored, 'J')}</strong> at charge voltages up to <strong data-figure="maxChargeVoltage" data-si="${volts}">${formatQuantity(volts, 'V')}</strong>: <strong class="hazard-class">${escapeHtml(classesText(classes))}</strong>.
This page is a model, <strong>not a licence to fire</strong>: discharge, short and ground every capacitor before any work; local codes and your institution's rules decide. <a href="#safety">Full procedures at the end of this page.</a></p>
</section>`;
}

function groupTable(bank: BankOnPage): string {
  if (!bank.groups) return '';
  const rows = bank.groups
    .map((g) => {
      const energy = 0.5 * g.count * g.capacitance * g.voltage ** 2;
      return `<tr><td>${escapeHtml(g.label)}</td><td class="num">${g.count}</td><td class="num">${formatQuantity(g.capacitance, 'F')}</td><td class="num">${formatQuantity(g.voltage, 'V')}</td><td class="num">${formatQuantity(energy, 'J')}</td></tr>`;
    })
    .join('');
  return `<table><thead><tr><th>Group</th><th class="num">Modules n</th><th class="num">C per module</th><th class="num">V0</th><th class="num">\u00BD\u00B7n\u00B7C\u00B7V0\u00B2</th></tr></thead><tbody>${rows}</tbody></table>`;
}

function banksTable(banks: readonly BankOnPage[]): string {
  if (banks.length === 1) {
    const bank = banks[0]!;
    return `<p class="lead">As configured, this bank stores <strong>${formatQuantity(bank.hazard.storedEnergy, 'J')}</strong> (\u03A3 \u00BD\u00B7n\u00B7C\u00B7V0\u00B2) at charge voltages up to <strong>${formatQuantity(bank.hazard.maxChargeVoltage, 'V')}</strong>: ${escapeHtml(classesText(bank.hazard.classes))}.</p>${groupTable(bank)}`;
  }
  const rows = banks
    .map((b) => `<tr><td>${escapeHtml(b.name ?? '')}</td><td class="num">${formatQuantity(b.hazard.storedEnergy, 'J')}</td><td class="num">${formatQuantity(b.hazard.maxChargeVoltage, 'V')}</td><td>${escapeHtml(classesText(b.hazard.classes))}</td></tr>`)
    .join('');
  return `<table><thead><tr><th>Bank</th><th class="num">Stored energy</th><th class="num">Highest V0</th><th>Hazard class</th></tr></thead><tbody>${rows}</tbody></table>`;
}

/** The full safety section for the end of a page. */
export function safetyProcedures(banks: readonly BankOnPage[]): string {
  const count = banks.length;
  return `<section class="safety" id="safety" aria-labelledby="safety-title">
<h2 id="safety-title">Safety: ${count === 1 ? 'this bank stores' : 'these banks store'} lethal energy</h2>
<p class="lead"><strong>A charged capacitor bank can kill.</strong> A bank that has been discharged can recover voltage (dielectric absorption).</p>
${count > 0 ? banksTable(banks) : ''}
<ul>
<li><strong>Before anyone reaches into the bank, the feed, the rails or the armature:</strong> switch off and lock out the charger, discharge every group through its dump resistor, then short and ground every capacitor terminal with a grounding stick and leave shorting straps in place while working. Through a resistor R the voltage falls from V0 to V in R\u00B7C\u00B7ln(V0/V); a bleeder resistor alone is no proof of a safe bank.</li>
<li>Discharge time: ${escapeHtml(DISCHARGE_RULE)}</li>
<li>Hazard classes shown on this page: DOE-HDBK-1092 capacitor hazard classes (shock hazard at 100 V or more and 10 J or more; thermal hazard below 100 V above 100 J; arc-flash hazard at 100 V or more and 10 kJ or more), as used in national-laboratory electrical safety manuals.</li>
<li>Interlocks on every enclosure door that dump the bank when opened; a fail-safe dump on loss of power; a charge-voltage indicator readable from the firing position; one key for charge and fire, held by the operator.</li>
<li>Personal protection as your rules require (arc-rated face shield and clothing, hearing protection, eye protection); a catch box and a cleared line of fire \u2014 the armature, the muzzle arc and debris leave at high speed.</li>
</ul>
<p><strong>These figures come from a model. They are not a licence to build, charge or fire anything.</strong> Follow local electrical codes, your institution's high-voltage safety rules and licensed practice, and have the design and the procedures reviewed by whoever is responsible for high-voltage safety where you work.</p>
</section>`;
}

/** "1 group of 4 modules", "4 groups, 16 modules". */
export function bankSize(groups: ReadonlyArray<{ count: number }>): string {
  const modules = groups.reduce((n, g) => n + g.count, 0);
  if (groups.length === 1) return `1\u00A0group of ${formatCount(modules, 'module')}`;
  return `${formatCount(groups.length, 'group')}, ${formatCount(modules, 'module')}`;
}
