/**
 * `railpulse size <scenario>`: the least-stored-energy bank that reaches the scenario's target within its limits.
 * Wiring only: the search is src/study/size.ts; the sized file and its record are filed like any other.
 */
import { basename, dirname, extname } from 'node:path';
import type { Command } from 'commander';
import { EXIT } from '../core/errors.js';
import { largest } from '../core/extrema.js';
import { checkNewFile, checkWritableFolder, writeExactFile, writeNewFile } from '../output/write.js';
import { checkFilingPlace, recordShot } from '../pipeline/record.js';
import { shoot } from '../pipeline/shoot.js';
import { loadScenarioText } from '../scenario/load.js';
import { runShot } from '../solve/shot.js';
import { sizeBank, type SizingCandidate, type SizingResult } from '../study/size.js';
import { readSizingInput } from '../study/sizeInput.js';
import { sizedScenarioJson } from '../study/sizedScenario.js';
import { say } from './common.js';
import { parseWholeNumber } from '../study/plan.js';
import { monteCarloLines, monteCarloOfSizing } from '../study/sizeCheck.js';

const kV = (volts: number): string => `${(volts / 1e3).toFixed(3)} kV`;
const kJ = (joules: number): string => `${(joules / 1e3).toFixed(2)} kJ`;

/** Why a candidate is not feasible, in words (a value exactly at a limit is within it). */
function candidateState(candidate: SizingCandidate, result: SizingResult): string {
  if (candidate.violations.length === 0) return candidate === result.best ? 'feasible, least stored energy' : 'feasible';
  if (!candidate.reached) {
    const velocity = candidate.results ? `${candidate.results.muzzleVelocity.toFixed(2)} m/s` : 'less than the target';
    return `reaches only ${velocity} at the chargeVoltage limit`;
  }
  return candidate.violations.map((v) => (v.limit === 'exit' ? 'does not leave the muzzle' : `exceeds ${v.limit}`)).join('; ');
}

function bindingText(result: SizingResult): string {
  if (result.binding.length === 0) return 'none (the optimum lies inside every limit)';
  return result.binding
    .map((name) => (name === 'modulesPerGroup' && result.beyondModuleLimit ? `modulesPerGroup (${result.beyondModuleLimit.modulesPerGroup} per group would store ${kJ(result.beyondModuleLimit.storedEnergy)})` : name))
    .join(', ');
}

function describeSizing(result: SizingResult): string[] {
  const lines = result.candidates.map((candidate) => {
    const current = candidate.results ? `${(candidate.results.peakCurrent / 1e3).toFixed(1)} kA` : '?';
    return `  ${candidate.modulesPerGroup} module(s)/group: ${kV(largest(candidate.chargeVoltages))}, ${kJ(candidate.storedEnergy)} stored, peak ${current} — ${candidateState(candidate, result)}`;
  });
  const head: string[] = [];
  if (result.best) {
    const best = result.best;
    head.push(`sized: ${best.modulesPerGroup} module(s) per group at ${best.chargeVoltages.map((v) => `${(v / 1e3).toFixed(4)} kV`).join(', ')}, triggers ${best.triggers.map((t) => `${(t * 1e6).toFixed(1)} µs`).join(', ')}; ${(best.storedEnergy / 1e3).toFixed(3)} kJ stored for ${result.targetVelocity.toFixed(2)} m/s`);
    head.push(`binding limit: ${bindingText(result)}`);
    if (best.confidence) {
      const c = best.confidence;
      head.push(`met with ${(100 * c.level).toFixed(1)} % confidence (linear propagation): nominal ${best.results!.muzzleVelocity.toFixed(1)} m/s, σ ${c.sigma.muzzleVelocity.toFixed(1)} m/s, ${(100 * (1 - c.level)).toFixed(1)}th percentile ${c.velocityAtConfidence.toFixed(1)} m/s`);
    }
  } else {
    head.push(`no design reaches ${result.targetVelocity.toFixed(2)} m/s within the limits; binding: ${result.binding.join(', ')}`);
  }
  for (const note of result.notes) head.push(`note: ${note}`);
  lines.push(`${result.shots} shots. Simulated sizing only: a charged bank can kill — follow your institution's safety rules, local codes and licensed practice.`);
  return [...head, ...lines];
}

interface SizeFlags {
  out?: string;
  json?: boolean;
  report?: string | boolean;
  monteCarlo?: string;
  seed?: string;
  jobs?: string;
}

export async function sizeCommand(file: string, flags: SizeFlags): Promise<SizingResult> {
  const input = readSizingInput(file);
  const check = flags.monteCarlo === undefined ? null : {
    shots: parseWholeNumber('--monte-carlo', flags.monteCarlo, 2),
    seed: flags.seed === undefined ? 1 : parseWholeNumber('--seed', flags.seed, 0),
    ...(flags.jobs === undefined ? {} : { jobs: parseWholeNumber('--jobs', flags.jobs, 1) }),
  };
  const folder = dirname(file);
  const defaultBase = `${basename(file, extname(file))}.sized-${input.sha256.slice(0, 8)}`;
  // Output names first: the search runs hundreds of shots, and must not end in "exists already".
  if (flags.out !== undefined) checkNewFile(flags.out, '--out');
  else checkWritableFolder(folder, '--out');
  if (flags.report !== false) checkFilingPlace(typeof flags.report === 'string' ? flags.report : undefined);
  say('sizing…');
  const result = sizeBank(input.scenario, input.target, input.limits, runShot);
  for (const line of describeSizing(result)) say(line);
  const monteCarlo = check ? await monteCarloOfSizing(result, input.limits, check) : null;
  if (check && !monteCarlo && result.feasible) say('note: --monte-carlo: the scenario has no tolerances and no calibration, so there is nothing to draw');
  if (monteCarlo) for (const line of monteCarloLines(result, monteCarlo)) say(line);
  let written: string | null = null;
  if (result.scenario) {
    const json = sizedScenarioJson(input.raw, { file, name: input.scenario.name, sha256: input.sha256 }, result);
    // the file must load like any scenario before it is written
    const sized = loadScenarioText(json, flags.out ?? `${defaultBase}.json`);
    if (flags.out !== undefined) {
      writeExactFile(flags.out, json, '--out');
      written = flags.out;
    } else {
      // the default name is ours: a second sizing of the same file gets the next free name (-2, -3 …)
      written = writeNewFile(folder, defaultBase, '.json', json);
    }
    say(`wrote ${written}`);
    if (flags.report !== false) say(`report: ${recordShot(shoot({ ...sized, file: written }), typeof flags.report === 'string' ? flags.report : undefined)}`);
  }
  if (flags.json) {
    const checked = monteCarlo ? { monteCarlo: { ...monteCarlo, samples: undefined, sampleOutcomes: undefined } } : {};
    process.stdout.write(`${JSON.stringify({ ...result, ...checked, written }, null, 2)}\n`);
  }
  // No feasible design is an answer, not a failure: its own exit code, distinct from bad input and from a defect.
  if (!result.feasible) process.exitCode = EXIT.negative;
  return result;
}

export function registerSizeCommand(program: Command): void {
  program
    .command('size <scenario>')
    .description("size the bank for the scenario's target (least stored energy within its limits)")
    .option('--out <file>', 'the sized scenario (default: <scenario>.sized-<hash>.json beside it)')
    .option('--json', 'print the sizing result as JSON on stdout')
    .option('--report <path>', 'where to write the shot record of the sized design (default reports/)')
    .option('--no-report', 'do not write the shot record')
    .option('--monte-carlo <shots>', 'check the sized design with this many shots of its tolerances and calibration drawn at random (worker threads)')
    .option('--seed <n>', 'seed of the Monte Carlo draws (default 1)')
    .option('--jobs <n>', 'worker threads of the Monte Carlo (default: all cores)')
    .action(async (scenario: string, flags: SizeFlags) => {
      await sizeCommand(scenario, flags);
    });
}
