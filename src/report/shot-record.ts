/**
 * The self-contained HTML shot report: one file a lab can file with the shot, readable offline for
 * years. Pure string building, browser-safe: the plotly bundle's text is an argument (html.ts reads it from
 * node_modules; the design page passes the copy it carries). Same input → same bytes (the date comes from the
 * provenance).
 */
import { statusOf } from '../checks/assess.js';
import { bankHazard } from '../checks/hazard.js';
import type { Scenario } from '../scenario/types.js';
import type { Shot, ShotResults } from '../solve/types.js';
import { columnFormatter, formatPercent, formatQuantity, GN, STANDARD_GRAVITY } from '../units/format.js';
import type { DecimateOptions } from './decimate.js';
import {
  embeddedElements,
  REPORT_FORMAT,
  REPORT_FORMAT_VERSION,
  type EmbeddedResultsBlock,
  type ReportCheck,
  type ReportProvenance,
} from './embedded.js';
import { escapeHtml, jsonScriptElement } from './escape.js';
import { PLOTLY_PACKAGE } from './plotly-names.js';
import { energyBudgetParts, shotFigures, type PlotFigure } from './plots.js';
import { overlayElement, overlayFigures, overlaySection, type OverlayInput } from './overlay.js';
import { bankSize, safetyBanner, safetyProcedures, type BankOnPage } from './safety.js';
import { statusBanner } from './status.js';
import { uncertaintySection, type RecordUncertainty } from './uncertainty.js';
import { DATE_SCRIPT, dateHtml, pageStart } from './styles.js';
import { checksSection, eventsSection, inputsSection, modulesSection, provenanceSection } from './tables.js';

export { readEmbedded, type EmbeddedReport, type ReportCheck, type ReportProvenance } from './embedded.js';

export interface ShotReportInput {
  /** the scenario JSON as the user wrote it */
  scenarioRaw: unknown;
  /** the same scenario in SI, defaults filled in */
  scenario: Scenario;
  shot: Shot;
  provenance: ReportProvenance;
  checks?: ReportCheck[];
  /** the shot's warnings (src/checks/warnings.ts) and any the caller adds; each shown once */
  warnings: string[];
  /** waveform decimation for the plots (default: about 3,000 points a plot, at most 4,000) */
  decimate?: DecimateOptions;
  /** measured traces to draw over the simulated ones, with goodness of fit (and a calibration) */
  overlay?: OverlayInput;
  /** the results' uncertainty, and bands for the current and velocity plots */
  uncertainty?: RecordUncertainty;
}

export { STANDARD_GRAVITY };

const OUTCOME_TEXT: Record<ShotResults['outcome'], string> = {
  exited: 'left the muzzle',
  stalled: 'stalled in the bore',
  timeout: 'end time reached in the bore',
  discharged: 'bank discharged into the short (ring-down)',
};

interface KeyFigure {
  key: string;
  label: string;
  si: number | null;
  text: string;
  aside?: string;
}

function keyFigures(results: ShotResults): KeyFigure[] {
  const e = results.energy;
  const moduleShare = e.magnetic - e.magneticRails;
  const exited = results.outcome === 'exited';
  return [
    {
      key: 'muzzleVelocity',
      label: exited ? 'Muzzle velocity' : 'Final velocity (no exit)',
      si: results.muzzleVelocity,
      text: formatQuantity(results.muzzleVelocity, 'm/s'),
    },
    {
      key: 'exitTime',
      label: 'Exit time',
      si: results.exitTime,
      text: results.exitTime === null ? 'no exit' : formatQuantity(results.exitTime, 's'),
      aside: `final position ${formatQuantity(results.finalPosition, 'm')}`,
    },
    { key: 'efficiency', label: 'Efficiency (kinetic / stored)', si: results.efficiency, text: formatPercent(results.efficiency) },
    { key: 'energy.kinetic', label: exited ? 'Kinetic energy at exit' : 'Kinetic energy at the end', si: e.kinetic, text: formatQuantity(e.kinetic, 'J') },
    {
      key: 'peakCurrent',
      label: 'Peak current',
      si: results.peakCurrent,
      text: formatQuantity(results.peakCurrent, 'A'),
      aside: `at <span data-figure="peakCurrentTime" data-si="${results.peakCurrentTime}">${formatQuantity(results.peakCurrentTime, 's')}</span>`,
    },
    {
      key: 'peakAcceleration',
      label: 'Peak acceleration',
      si: results.peakAcceleration,
      text: formatQuantity(results.peakAcceleration, 'm/s\u00B2'),
      aside: `${formatQuantity(results.peakAcceleration / STANDARD_GRAVITY, GN)} (g\u2099 = 9.80665 m/s\u00B2)`,
    },
    { key: 'peakBreechVoltage', label: 'Peak breech voltage', si: results.peakBreechVoltage, text: formatQuantity(results.peakBreechVoltage, 'V') },
    { key: 'actionIntegral', label: 'Action integral \u222BI\u00B2dt', si: results.actionIntegral, text: formatQuantity(results.actionIntegral, 'A\u00B2\u00B7s') },
    { key: 'energy.initial', label: 'Stored energy E0', si: e.initial, text: formatQuantity(e.initial, 'J') },
    {
      key: 'energy.magneticRails',
      label: exited ? 'Muzzle arc must absorb' : 'Magnetic energy, feed and rails',
      si: e.magneticRails,
      text: formatQuantity(e.magneticRails, 'J'),
      aside:
        `½L(x)I² in feed and rails, plus up to <span data-figure="moduleInductorEnergy" data-si="${moduleShare}">${formatQuantity(moduleShare, 'J')}</span>` +
        ' from the module inductors (the module resistances take part of it)',
    },
    ...(e.afterExit !== undefined
      ? [{ key: 'energy.afterExit', label: 'Energy after exit (muzzle-arc bound)', si: e.afterExit, text: formatQuantity(e.afterExit, 'J'), aside: 'all magnetic energy plus the capacitors of modules still conducting or armed at exit: the arc gets at most this' }]
      : []),
    ...(results.transitionTime !== undefined
      ? [{ key: 'transitionTime', label: 'Contact turns into an arc', si: results.transitionTime, text: formatQuantity(results.transitionTime, 's'), aside: `at <span data-figure="transitionPosition" data-si="${results.transitionPosition}">${formatQuantity(results.transitionPosition!, 'm')}</span> from the breech` }]
      : []),
    ...(results.armatureTemperature !== undefined
      ? [{ key: 'armatureTemperature', label: 'Armature temperature (adiabatic)', si: results.armatureTemperature, text: formatQuantity(results.armatureTemperature, '\u00B0C') }]
      : []),
    ...(results.railTemperature !== undefined
      ? [{ key: 'railTemperature', label: 'Rail surface temperature at the breech (adiabatic)', si: results.railTemperature, text: formatQuantity(results.railTemperature, '\u00B0C') }]
      : []),
  ];
}

export function figuresSection(results: ShotResults): string {
  const items = keyFigures(results)
    .map((f) => {
      const si = f.si === null ? '' : ` data-si="${f.si}"`;
      const aside = f.aside ? `<span class="aside">${f.aside}</span>` : '';
      return `<div class="figure"><dt>${escapeHtml(f.label)}</dt><dd><span class="value" data-figure="${f.key}"${si}>${f.text}</span>${aside}</dd></div>`;
    })
    .join('\n');
  return `<section id="key-figures" aria-label="Key figures"><dl class="figures">\n${items}\n</dl></section>`;
}

function headerSection(scenario: Scenario, results: ShotResults, provenance: ReportProvenance): string {
  const outcome = results.outcome;
  const filing = scenario.record ?? {};
  const filed = (
    [
      ['shotId', 'Shot', filing.shotId],
      ['operator', 'Operator', filing.operator],
      ['reviewer', 'Reviewer', filing.reviewer],
    ] as const
  )
    .filter(([, , value]) => value)
    .map(([key, label, value]) => `<span><b>${label}</b> <span data-record="${key}">${escapeHtml(value)}</span></span>`)
    .join('\n');
  return `<header>
<p class="kicker">railpulse \u00B7 shot record (simulation)</p>
<h1 id="scenario-name">${escapeHtml(scenario.name)}</h1>
${scenario.description ? `<p class="description" id="scenario-description">${escapeHtml(scenario.description)}</p>` : ''}
<p>Outcome: <span class="outcome outcome-${escapeHtml(outcome)}" data-figure="outcome" data-value="${escapeHtml(outcome)}">${escapeHtml(OUTCOME_TEXT[outcome] ?? outcome)}</span></p>
<div class="meta">${filed}
<span><b>Date</b> ${dateHtml(provenance.date)}</span>
<span><b>Scenario SHA-256</b> <code>${escapeHtml(provenance.scenarioSha256.slice(0, 16))}</code></span>
<span><b>Tool</b> railpulse ${escapeHtml(provenance.toolVersion)}</span>
<span><b>Bank</b> ${bankSize(scenario.bank)}</span></div>
${filing.notes ? `<p class="note" id="record-notes"><b>Notes:</b> <span data-record="notes">${escapeHtml(filing.notes)}</span></p>` : ''}
</header>`;
}

export function budgetTable(results: ShotResults): string {
  const initial = results.energy.initial;
  const parts = energyBudgetParts(results);
  const energy = columnFormatter([initial, ...parts.map((p) => p.energy)], 'J');
  const rows = parts
    .map(
      (p) =>
        `<tr data-budget="${escapeHtml(p.key)}"><td>${escapeHtml(p.label)}</td><td class="num">${energy.format(p.energy)}</td><td class="num">${formatPercent(p.energy / initial)}</td></tr>`,
    )
    .join('\n');
  return `<table class="budget"><thead><tr><th>Where the stored energy is at the end of the in-bore phase</th><th class="num">Energy</th><th class="num">Share of E0</th></tr></thead>
<tbody>${rows}</tbody><tfoot><tr><th>Total = stored energy E0</th><th class="num">${energy.format(initial)}</th><th class="num">100\u00A0%</th></tr></tfoot></table>
<p class="note">The module-inductor energy is shared between the muzzle arc and the module resistances, so the arc energy lies between the feed-and-rails part and the sum of both magnetic parts.</p>`;
}

function plotsSection(figures: PlotFigure[], results: ShotResults, hasWaveforms: boolean): string {
  const blocks = figures
    .map((f) => {
      const extra = f.id === 'plot-budget' ? budgetTable(results) : '';
      return `<div class="plot-block"><h3>${escapeHtml(f.title)}</h3><p class="caption">${escapeHtml(f.caption)}</p><div class="plot" id="${f.id}" data-plot></div>${extra}</div>`;
    })
    .join('\n');
  const note = hasWaveforms ? '' : '<p class="note">Waveforms were not sampled for this shot; only the end-of-bore budget is shown.</p>';
  return `<section id="plots"><h2>Waveforms and energy</h2>${note}\n${blocks}\n</section>`;
}

/**
 * Draw every figure once the page has painted (the safety banner, the status and the figures show at once, the plots
 * follow); mark the body when all are drawn (tests and printing wait for it).
 */
const RENDER_SCRIPT = `${DATE_SCRIPT}
(function () {
  var figures = JSON.parse(document.getElementById('railpulse-plots').textContent);
  var config = { displaylogo: false, responsive: true, modeBarButtonsToRemove: ['select2d', 'lasso2d'],
    toImageButtonOptions: { format: 'png', scale: 2 } };
  function draw() {
    var drawn = figures.map(function (f) { return Plotly.newPlot(f.id, f.data, f.layout, config); });
    Promise.all(drawn).then(function () { document.body.setAttribute('data-plots', 'rendered'); },
      function (error) { document.body.setAttribute('data-plots', 'failed'); console.error(error); });
  }
  requestAnimationFrame(function () { setTimeout(draw, 0); });
  // Paper is narrower than a screen: fit the plots to the printed page, and back afterwards.
  function resizeAll() { figures.forEach(function (f) { Plotly.Plots.resize(document.getElementById(f.id)); }); }
  window.addEventListener('beforeprint', resizeAll);
  window.addEventListener('afterprint', resizeAll);
})();`

/** The bank of a shot as the safety banner and the safety section show it. */
export function bankOnPage(scenario: Scenario): BankOnPage {
  return { hazard: bankHazard(scenario.bank, scenario.limits), groups: scenario.bank, name: scenario.name };
}

/** The record's HTML; `plotlySource` is the text of the plotly bundle named PLOTLY_PACKAGE, inlined as is. */
export function buildShotRecord(input: ShotReportInput, plotlySource: string): string {
  const { scenario, shot, provenance } = input;
  const results = shot.results;
  const warnings = [...new Set(input.warnings)];
  const checks = input.checks ?? [];
  const figures = shotFigures(scenario, results, shot.waveforms, input.decimate, shot.events, input.uncertainty?.bands ?? undefined);
  const bank = bankOnPage(scenario);
  const block: EmbeddedResultsBlock = {
    format: REPORT_FORMAT,
    formatVersion: REPORT_FORMAT_VERSION,
    scenarioName: scenario.name,
    scenarioDescription: scenario.description,
    results,
    provenance,
    warnings,
    checks,
    status: statusOf(checks, warnings),
    hazard: bank.hazard,
    ...(scenario.record ? { record: scenario.record } : {}),
  };
  const overlayPlots = input.overlay ? overlayFigures(shot.waveforms, input.overlay, input.decimate) : [];
  const plotData = [...overlayPlots, ...figures].map((f) => ({ id: f.id, data: f.data, layout: f.layout }));
  const title = input.overlay ? `${scenario.name} \u2014 measured against model (railpulse)` : `${scenario.name} \u2014 railpulse shot record`;
  return `${pageStart(title, { generator: `railpulse ${provenance.toolVersion}` })}
${embeddedElements(block, input.scenarioRaw)}${input.overlay ? `\n${overlayElement(input.overlay)}` : ''}
</head>
<body data-plots="pending">
<main>
${headerSection(scenario, results, provenance)}
${safetyBanner([bank])}
${statusBanner(checks, warnings)}
${figuresSection(results)}
${input.uncertainty ? uncertaintySection(input.uncertainty) : ''}
${input.overlay ? overlaySection(input.overlay, overlayPlots) : ''}
${checksSection(checks)}
${plotsSection(figures, results, shot.waveforms !== null)}
${modulesSection(scenario, results)}
${eventsSection(shot.events, results)}
${inputsSection(input.scenarioRaw, scenario)}
${provenanceSection(provenance, PLOTLY_PACKAGE)}
${safetyProcedures([bank])}
<footer>Simulation record produced by railpulse ${escapeHtml(provenance.toolVersion)} from the scenario embedded in this file. Model results, not measurements. Plots by plotly.js (MIT licence), inlined.</footer>
</main>
${jsonScriptElement('railpulse-plots', plotData)}
<script>${plotlySource}</script>
<script>${RENDER_SCRIPT}</script>
</body>
</html>
`;
}
