/**
 * The uncertainty part of a shot record: each headline result with its standard uncertainty and interval, the
 * inputs that spread it, and what the propagation found (outcome changes, nonlinear responses, a Monte Carlo).
 * Builds HTML from values; the numbers come from src/study.
 */
import { escapeHtml } from './escape.js';
import { formatPercent, formatQuantity, formatWithUncertainty } from '../units/format.js';
import type { WaveformBands } from './plots.js';

export interface UncertaintyRow {
  /** a headline key: muzzleVelocity, exitTime, peakCurrent, efficiency, peakAcceleration, actionIntegral */
  key: string;
  nominal: number | null;
  /** one standard uncertainty (SI), null where it is not defined */
  sigma: number | null;
  /** the interval of the chosen coverage, when defined */
  interval: [number, number] | null;
}

export interface RecordUncertainty {
  /** how it was obtained, e.g. "linear propagation of 5 inputs, 21 shots" */
  method: string;
  /** what the interval column is, e.g. "95 % interval (±1.96σ, normal approximation)" */
  intervalLabel: string;
  rows: UncertaintyRow[];
  /** each input as people read it, e.g. "bank[*].capacitance — uniform ±5 %, tolerance" */
  inputs: string[];
  /** warnings and further findings (a Monte Carlo summary), one sentence each */
  notes: string[];
  bands: WaveformBands | null;
}

/** Each headline result: how people call it and its SI unit ('%' for the efficiency, a fraction in SI). */
export const HEADLINE_LABELS: Record<string, [label: string, unit: string]> = {
  muzzleVelocity: ['Muzzle velocity', 'm/s'],
  exitTime: ['Exit time', 's'],
  peakCurrent: ['Peak current', 'A'],
  efficiency: ['Efficiency', '%'],
  peakAcceleration: ['Peak acceleration', 'm/s\u00B2'],
  actionIntegral: ['Action integral \u222BI\u00B2dt', 'A\u00B2\u00B7s'],
};

/** A headline value for people (the efficiency as a percentage). */
export function showHeadline(key: string, value: number | null): string {
  const unit = HEADLINE_LABELS[key]?.[1] ?? '';
  return unit === '%' ? formatPercent(value) : formatQuantity(value, unit);
}

/** A headline value with its standard uncertainty, both in the value's unit and prefix (GUM §7.2.6). */
export function showWithUncertainty(key: string, value: number | null, sigma: number | null): string {
  if (value === null) return showHeadline(key, value);
  const unit = HEADLINE_LABELS[key]?.[1] ?? '';
  // a percentage: both figures in per cent, then the sign
  if (unit === '%') return `${formatWithUncertainty(value * 100, (sigma ?? NaN) * 100, '1')}\u00A0%`;
  return formatWithUncertainty(value, sigma ?? NaN, unit);
}

export function uncertaintySection(uncertainty: RecordUncertainty): string {
  const rows = uncertainty.rows
    .map((row) => {
      const label = HEADLINE_LABELS[row.key]?.[0] ?? row.key;
      const show = (value: number | null): string => showHeadline(row.key, value);
      const interval = row.interval ? `${show(row.interval[0])} \u2026 ${show(row.interval[1])}` : '\u2014';
      return `<tr data-uncertainty="${escapeHtml(row.key)}"${row.sigma === null ? '' : ` data-si="${row.sigma}"`}><td>${escapeHtml(label)}</td><td class="num">${show(row.nominal)}</td><td class="num">${row.sigma === null ? 'not defined' : `\u00B1\u00A0${show(row.sigma)}`}</td><td class="num">${interval}</td></tr>`;
    })
    .join('\n');
  const inputs = uncertainty.inputs.map((input) => `<li>${escapeHtml(input)}</li>`).join('');
  const notes = uncertainty.notes.map((note) => `<li>${escapeHtml(note)}</li>`).join('');
  return `<section id="uncertainty"><h2>Uncertainty</h2>
<p class="note">${escapeHtml(uncertainty.method)}.</p>
<table class="uncertainty"><thead><tr><th>Result</th><th class="num">Nominal</th><th class="num">Standard uncertainty (1σ)</th><th class="num">${escapeHtml(uncertainty.intervalLabel)}</th></tr></thead>
<tbody>${rows}</tbody></table>
<p>Uncertain inputs:</p><ul class="uncertainty-inputs">${inputs}</ul>
${notes ? `<ul class="uncertainty-notes">${notes}</ul>` : ''}
</section>`;
}
