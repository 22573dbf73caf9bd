/**
 * `railpulse overlay` and `railpulse fit`: a fired shot's records against the model. Wiring only: the CSV
 * reading, the fit and the goodness of fit are in src/measure, the page in src/report.
 */
import { basename, dirname, extname } from 'node:path';
import { performance } from 'node:perf_hooks';
import type { Command } from 'commander';
import { calibratedScenarioRaw } from '../measure/calibrated.js';
import { carriedValues, type FittedValue } from '../measure/carry.js';
import { InputError } from '../core/errors.js';
import { fitScenario, type FitResult } from '../measure/fit.js';
import { goodnessOfFit, requireComparedSamples, type GoodnessOfFit } from '../measure/goodness.js';
import { sampledLikeMeasurement } from '../measure/sampling.js';
import { setScenarioPath } from '../scenario/paths.js';
import { fileSha256 } from '../output/hash.js';
import { reportDate } from '../output/provenance.js';
import { writeNewFile } from '../output/write.js';
import { DEFAULT_REPORT_DIR, recordShot } from '../pipeline/record.js';
import { inFile, shoot, type AssessedShot } from '../pipeline/shoot.js';
import { formatPercent, formatQuantity, formatWithUncertainty } from '../units/format.js';
import { siUnitOfPath } from '../report/inputs.js';
import type { OverlayFit, OverlayInput } from '../report/overlay.js';
import { loadScenarioFile, loadScenarioText, type LoadedScenario } from '../scenario/load.js';
import type { Scenario } from '../scenario/types.js';
import { runShot } from '../solve/shot.js';
import type { Shot } from '../solve/types.js';
import { collect } from './common.js';
import { parseFreeList, parseNoise, parseWeights, readMeasuredInputs, type MeasuredInputs, type MeasureFlags } from './measure-options.js';

const CAUTION =
  'A calibrated model is still a model: before charging a bank for the next shot, follow your institution\'s safety rules, local codes and licensed practice — a charged capacitor bank can kill.';

interface OverlayFlags extends MeasureFlags {
  /** a folder or .html file; false with --no-report */
  report?: string | boolean;
  json?: boolean;
  wholeShot?: boolean;
}

const reportTarget = (flags: OverlayFlags): string | undefined => (typeof flags.report === 'string' ? flags.report : undefined);

interface FitFlags extends OverlayFlags {
  free?: string[];
  weight?: string[];
  noise?: string[];
  carryInto?: string;
  carryToAllGroups?: boolean;
}

/** JSON with NaN and ±∞ as null (an uncertainty on a bound is not a number). */
function toJson(value: unknown): string {
  return `${JSON.stringify(value, (_, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2)}\n`;
}

function measuredFigures(inputs: MeasuredInputs): OverlayInput['measured'] {
  return {
    ...(inputs.muzzleVelocity !== undefined ? { muzzleVelocity: inputs.muzzleVelocity } : {}),
    ...(inputs.exitTime !== undefined ? { exitTime: inputs.exitTime } : {}),
  };
}

function compare(shot: Shot, inputs: MeasuredInputs): GoodnessOfFit {
  return goodnessOfFit(shot, inputs.measurement, { ...measuredFigures(inputs), ...(inputs.positions ? { positions: inputs.positions } : {}) });
}

/** The overlay part of the record: the measured traces, the figures given on the command line, the goodness of fit. */
function overlayInput(inputs: MeasuredInputs, goodness: GoodnessOfFit, flags: OverlayFlags, fit?: OverlayFit): OverlayInput {
  return {
    measurement: inputs.measurement,
    ...(inputs.positions ? { positions: inputs.positions } : {}),
    measured: measuredFigures(inputs),
    goodness,
    ...(fit ? { fit } : {}),
    ...(flags.wholeShot ? { wholeShot: true } : {}),
  };
}

function goodnessLines(goodness: GoodnessOfFit): string[] {
  const lines: string[] = [];
  for (const [name, s] of Object.entries(goodness.signals)) {
    const unit = name === 'I' ? 'A' : 'V';
    lines.push(`  RMS error ${name}: ${formatQuantity(s.rms, unit)} (${formatPercent(s.relativeRms)} of the measured peak, ${s.points} samples)`);
  }
  const row = (label: string, c: GoodnessOfFit['peakCurrent'], unit: string): void => {
    if (c) lines.push(`  ${label}: model ${formatQuantity(c.model, unit)}, measured ${formatQuantity(c.measured, unit)}, error ${formatQuantity(c.error, unit)}`);
  };
  row('peak current', goodness.peakCurrent, 'A');
  row('time of peak current', goodness.peakCurrentTime, 's');
  row('exit time', goodness.exitTime, 's');
  row('muzzle velocity', goodness.muzzleVelocity, 'm/s');
  if (goodness.arrivalTimeErrors) lines.push(`  probe arrival-time errors: ${goodness.arrivalTimeErrors.map((e) => (e === null ? 'not reached' : formatQuantity(e, 's'))).join(', ')}`);
  const rule = goodness.samples;
  if (rule && rule.excluded.length > 0) {
    lines.push(`  not compared: ${rule.excluded.length} sample(s) within one sample interval (${formatQuantity(rule.interval, 's')}) of a switching instant of the model${timesList(rule.excluded)}`);
  }
  if (rule && rule.outside > 0) lines.push(`  not compared: ${rule.outside} sample(s) outside the model's span`);
  return lines;
}

/** At most a few times, for a terminal line; the record and --json list them all. */
function timesList(times: readonly (number | null)[]): string {
  const shown = times.slice(0, 8).map((t) => (t === null ? 'muzzle velocity' : formatQuantity(t, 's')));
  return shown.length ? ` (at ${shown.join(', ')}${times.length > shown.length ? `, … ${times.length - shown.length} more` : ''})` : '';
}

export function overlayCommand(file: string, csv: string, flags: OverlayFlags): GoodnessOfFit {
  const loaded = loadScenarioFile(file);
  const inputs = readMeasuredInputs(csv, flags, loaded.scenario);
  const assessed: AssessedShot = shoot(loaded, { scenario: sampledLikeMeasurement(loaded.scenario, inputs.measurement) });
  const goodness = compare(assessed.shot, inputs);
  requireComparedSamples(goodness, inputs.measurement);
  const written = flags.report === false ? null : recordShot(assessed, reportTarget(flags), overlayInput(inputs, goodness, flags));
  const reportLine = written ? [`report: ${written}`] : [];
  if (flags.json) {
    process.stdout.write(toJson(goodness));
    if (written) process.stderr.write(`report: ${written}\n`);
  } else {
    process.stdout.write([`overlay of ${csv} on ${file}:`, ...goodnessLines(goodness), ...reportLine].join('\n') + '\n');
  }
  return goodness;
}

/** The fitted values for the report, with display units. */
function overlayFit(fit: FitResult): OverlayFit {
  const parameters: OverlayFit['parameters'] = {};
  for (const [path, p] of Object.entries(fit.parameters)) parameters[path] = { value: p.value, uncertainty: p.uncertainty, initial: p.initial, unit: siUnitOfPath(path) };
  const { samples } = fit;
  return {
    parameters,
    correlations: fit.correlations,
    residual: fit.residual,
    shots: fit.shots,
    iterations: fit.iterations,
    warnings: fit.warnings,
    outerIterations: samples.outerIterations,
    huberThreshold: samples.huberThreshold,
    blockSize: samples.blockSize,
    excluded: samples.excluded,
    downWeighted: samples.downWeighted,
  };
}

function fitLines(fit: FitResult, seconds: number): string[] {
  const names = Object.keys(fit.parameters);
  const width = names.reduce((w, n) => Math.max(w, n.length), 0);
  const lines = [`fit ${fit.converged ? 'converged' : 'did NOT converge'} after ${fit.iterations} iterations, ${fit.shots} shots, ${seconds.toFixed(2)} s (${fit.message})`];
  for (const name of names) {
    const p = fit.parameters[name]!;
    const unit = siUnitOfPath(name);
    const fitted = Number.isFinite(p.uncertainty) ? formatWithUncertainty(p.value, p.uncertainty, unit) : `${formatQuantity(p.value, unit)} (on a bound)`;
    lines.push(`  ${name.padEnd(width)}  ${fitted}   (initial ${formatQuantity(p.initial, unit)})`);
  }
  if (names.length > 1) {
    lines.push('correlations:');
    lines.push(`  ${''.padEnd(width)}  ${names.map((_, j) => `[${j + 1}]`.padStart(7)).join('')}`);
    names.forEach((a, i) => {
      const row = names.map((b, j) => (i === j ? 1 : fit.correlations[`${a}|${b}`] ?? fit.correlations[`${b}|${a}`] ?? NaN).toFixed(3).padStart(7)).join('');
      lines.push(`  ${`[${i + 1}] ${a}`.padEnd(width + 4)}${row}`);
    });
  }
  const groups = Object.entries(fit.residual.perGroup)
    .map(([name, g]) => `${name} RMS ${g.rmsSI.toPrecision(3)} (σ ${g.noise.toPrecision(3)}, ${g.points} points)`)
    .join('; ');
  lines.push(`residual: RMS ${fit.residual.rms.toPrecision(3)} noise units, χ²/ν = ${fit.residual.chiSquaredReduced.toPrecision(3)}; ${groups} (SI)`);
  const s = fit.samples;
  const decimated = s.blockSize > 1 ? `; record decimated into means of ${s.blockSize} samples, single samples kept next to each switching instant` : '';
  lines.push(`samples: Δt ${formatQuantity(s.interval, 's')}; ${s.excluded.length} left out within Δt of the model's ${s.instants.length} switching instants${timesList(s.excluded)}; ${s.outsideWindow} outside the model's span; ${s.outerIterations} fit run(s) with the set fixed${decimated}`);
  lines.push(`down-weighted (Huber, beyond ${s.huberThreshold} σ): ${s.downWeighted.length}${timesList(s.downWeighted.map((d) => d.t))}`);
  for (const warning of fit.warnings) lines.push(`warning: ${warning}`);
  return lines;
}

/**
 * `friction.staticCoefficient` defaults to μ in a scenario file; when the file leaves it to the default, a
 * fitted μ must carry it along, as loading the calibrated file will.
 */
function pathSetter(raw: Record<string, unknown>): (scenario: Scenario, path: string, value: number) => Scenario {
  const friction = raw.friction;
  const staticWritten = typeof friction === 'object' && friction !== null && 'staticCoefficient' in friction;
  return (scenario, path, value) => {
    const next = setScenarioPath(scenario, path, value);
    return path === 'friction.coefficient' && !staticWritten ? setScenarioPath(next, 'friction.staticCoefficient', value) : next;
  };
}

export function fitCommand(file: string, csv: string, flags: FitFlags): FitResult {
  const loaded = loadScenarioFile(file);
  const free = parseFreeList(flags.free, loaded.scenario);
  const weights = parseWeights(flags.weight);
  const noise = parseNoise(flags.noise);
  const inputs = readMeasuredInputs(csv, flags, loaded.scenario);
  if (flags.carryToAllGroups && !flags.carryInto) throw new InputError('--carry-to-all-groups', 'needs --carry-into FILE');
  // the scenario the calibration carries into is read (and the paths checked) before the fit runs
  const carryTarget = flags.carryInto ? loadScenarioFile(flags.carryInto) : null;
  if (carryTarget) carriedValues(Object.fromEntries(free.map((f) => [f.path, { value: NaN, uncertainty: NaN }])), carryTarget.scenario, flags.carryInto!, flags.carryToAllGroups === true);
  const started = performance.now();
  const fit = inFile(file, () =>
    fitScenario({
      scenario: loaded.scenario,
      measurement: inputs.measurement,
      free,
      ...(inputs.positions ? { positions: inputs.positions } : {}),
      ...(inputs.muzzleVelocity !== undefined ? { muzzleVelocity: inputs.muzzleVelocity } : {}),
      weights,
      noise,
      runShot: (scenario) => runShot(scenario),
      setPath: pathSetter(loaded.raw),
    }),
  );
  const seconds = (performance.now() - started) / 1000;

  const date = reportDate();
  const fitted = Object.fromEntries(Object.entries(fit.parameters).map(([path, p]) => [path, { value: p.value, uncertainty: p.uncertainty }]));
  const raw = calibratedScenarioRaw(loaded.raw, {
    scenarioFile: basename(file),
    measurementFile: basename(csv),
    date,
    fitted,
    measurementSha256: fileSha256(csv),
    correlations: fit.correlations,
    chiSquaredReduced: fit.residual.chiSquaredReduced,
  });
  const text = `${JSON.stringify(raw, null, 2)}\n`;
  // the calibrated file must load like any other before it is written
  const calibrated = loadScenarioText(text, 'calibrated scenario');
  const base = basename(file, extname(file));
  const scenarioPath = writeNewFile(dirname(file), `${base}.calibrated`, '.json', text);
  const loadedCalibrated = { ...calibrated, file: scenarioPath };

  const carriedPath = carryTarget ? carryInto(carryTarget, fitted, { ring: file, csv, date, allGroups: flags.carryToAllGroups === true }) : null;
  const carriedLine = carriedPath ? [`carried into: ${carriedPath} (${basename(flags.carryInto!)} with the fitted values, less the short's own)`] : [];

  const assessed = shoot(loadedCalibrated, { scenario: sampledLikeMeasurement(calibrated.scenario, inputs.measurement) });
  const goodness = compare(assessed.shot, inputs);
  const reportPath = flags.report === false ? null : recordShot(assessed, reportTarget(flags), overlayInput(inputs, goodness, flags, overlayFit(fit)));
  const reportLine = reportPath ? [`report: ${reportPath}`] : [];

  if (flags.json) {
    const parameters = Object.fromEntries(Object.entries(fit.parameters).map(([path, p]) => [path, { value: p.value, uncertainty: p.uncertainty, initial: p.initial }]));
    process.stdout.write(toJson({ parameters, correlations: fit.correlations, residual: fit.residual, samples: fit.samples }));
    const warnings = fit.warnings.map((w) => `warning: ${w}\n`).join('');
    process.stderr.write([`fit: ${fit.iterations} iterations, ${fit.shots} shots, ${seconds.toFixed(2)} s`, ...warnings.split('\n').filter(Boolean), `calibrated scenario: ${scenarioPath}`, ...carriedLine, ...reportLine, CAUTION].join('\n') + '\n');
  } else {
    const lines = [`fit of ${file} to ${csv}:`, ...fitLines(fit, seconds), 'calibrated shot against the measurement:', ...goodnessLines(goodness), `calibrated scenario: ${scenarioPath}`, ...carriedLine, ...reportLine, CAUTION];
    process.stdout.write(lines.join('\n') + '\n');
  }
  return fit;
}

/**
 * Write the fitted values (less the short's own) into a copy of another scenario of the same bank, beside it
 * and never over a file: `<name>.calibrated.json`, loaded once before it is written.
 */
function carryInto(target: LoadedScenario, fitted: Record<string, FittedValue>, from: { ring: string; csv: string; date: string; allGroups: boolean }): string {
  const values = carriedValues(fitted, target.scenario, target.file, from.allGroups);
  const raw = calibratedScenarioRaw(target.raw, { scenarioFile: basename(target.file), measurementFile: `${basename(from.csv)} (fitted on ${basename(from.ring)})`, date: from.date, fitted: values });
  const text = `${JSON.stringify(raw, null, 2)}\n`;
  loadScenarioText(text, `${target.file} with the carried values`);
  return writeNewFile(dirname(target.file), `${basename(target.file, extname(target.file))}.calibrated`, '.json', text);
}

function measureOptions(command: Command): Command {
  return command
    .option('--map <HEADER=SIGNAL>', 'read a column as t, I, V_breech or V_muzzle (or ignore it), e.g. CH1=I (repeatable)', collect)
    .option('--unit <HEADER=UNIT>', 'unit of a column, overriding its header, e.g. CH1=kA (repeatable)', collect)
    .option('--scale <HEADER=K>', 'multiply a column by K in its own unit (probe sensitivity; repeatable)', collect)
    .option('--offset <HEADER=VALUE>', 'add VALUE after scaling, with a unit or in the column unit, e.g. t=2us (repeatable)', collect)
    .option('--positions <file>', 'probe arrival times: a CSV with columns x [m] and t [us]')
    .option('--muzzle-velocity <value>', 'measured muzzle velocity, e.g. 512m/s')
    .option('--exit-time <value>', 'measured exit time, e.g. 1.32ms (a probe at the muzzle gives it too)')
    .option('--report <path>', `where to write the HTML report: a folder, or a new file ending in .html (default: ${DEFAULT_REPORT_DIR}/)`)
    .option('--no-report', 'do not write the HTML report')
    .option('--whole-shot', "draw the model over the whole simulated shot, not only over the record's span")
    .option('--json', 'print the result as JSON (SI) on stdout and nothing else');
}

export function registerMeasureCommands(program: Command): void {
  measureOptions(
    program
      .command('overlay')
      .description("a fired shot's measured signals against the model: goodness of fit and an HTML report")
      .argument('<scenario>', 'scenario file (JSON)')
      .argument('<measured>', 'oscilloscope / DAQ export (CSV): t and I, V_breech, V_muzzle columns with units'),
  ).action((file: string, csv: string, flags: OverlayFlags) => {
    overlayCommand(file, csv, flags);
  });
  measureOptions(
    program
      .command('fit')
      .description('calibrate scenario parameters to a measured shot; writes <scenario>.calibrated.json and an overlay report')
      .argument('<scenario>', 'scenario file (JSON)')
      .argument('<measured>', 'oscilloscope / DAQ export (CSV)')
      .option('--free <PATH[=lo:hi]>', 'a parameter to fit, with optional bounds in units, e.g. rails.inductanceGradient=0.3uH/m:0.6uH/m (repeatable)', collect)
      .option('--weight <SIGNAL=W>', 'weight of I, V_breech, V_muzzle, position or muzzleVelocity (default 1; 0 leaves it out; repeatable)', collect)
      .option('--noise <SIGNAL=VALUE>', 'noise σ of a signal with its unit, e.g. I=200A (default: estimated from the record; repeatable)', collect)
      .option('--carry-into <scenario>', 'also write the fitted bank and feed values into a copy of this scenario (e.g. a ring-down into the launch): <name>.calibrated.json beside it')
      .option('--carry-to-all-groups', 'with --carry-into: a value fitted for one group goes to that quantity of every group (groups of the same module)'),
  ).action((file: string, csv: string, flags: FitFlags) => {
    fitCommand(file, csv, flags);
  });
}
