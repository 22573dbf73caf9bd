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

/**
 * Why a candidate is not feasible, in words: a limit it exceeds, or one it sits at (a value exactly at a limit is
 * within it) while still short of the target.
 */
function candidateState(candidate: SizingCandidate): string {
  if (candidate.violations.length === 0) return 'feasible';
  return candidate.violations
    .map((v) => {
      if (v.limit === 'exit') return 'does not leave the muzzle';
      if (v.value > v.allowed) return `exceeds ${v.limit}`;
      const velocity = candidate.results ? `${candidate.results.muzzleVelocity.toFixed(2)} m/s` : 'less than the target';
      return `reaches only ${velocity} at the ${v.limit} limit`;
    })
    .join('; ');
}

function describeSizing(result: SizingResult): string[] {
  const lines = result.candidates.map((candidate) => {
    const volts = largest(candidate.chargeVoltages);
    const state = candidateState(candidate);
    const current = candidate.results ? `${(candidate.results.peakCurrent / 1e3).toFixed(1)} kA` : '?';
    return `  ${candidate.modulesPerGroup} module(s)/group: ${(volts / 1e3).toFixed(3)} kV, ${(candidate.storedEnergy / 1e3).toFixed(2)} kJ stored, peak ${current} — ${state}`;
  });
  if (result.best) {
    const best = result.best;
    lines.unshift(`sized: ${best.modulesPerGroup} module(s) per group at ${best.chargeVoltages.map((v) => `${(v / 1e3).toFixed(4)} kV`).join(', ')}, triggers ${best.triggers.map((t) => `${(t * 1e6).toFixed(1)} µs`).join(', ')}; ${(best.storedEnergy / 1e3).toFixed(3)} kJ stored for ${result.targetVelocity.toFixed(2)} m/s (nearest limit: ${result.binding.join(', ') || 'none set'})`);
  } else {
    lines.unshift(`no design reaches ${result.targetVelocity.toFixed(2)} m/s within the limits; binding: ${result.binding.join(', ')}`);
  }
  lines.push(`${result.shots} shots. Simulated sizing only: a charged bank can kill — follow your institution's safety rules, local codes and licensed practice.`);
  return lines;
}

export async function sizeCommand(file: string, flags: { out?: string; json?: boolean; report?: string | boolean }): Promise<SizingResult> {
  const input = readSizingInput(file);
  const folder = dirname(file);
  const defaultBase = `${basename(file, extname(file))}.sized-${input.sha256.slice(0, 8)}`;
  // Output names first: the search runs hundreds of shots, and must not end in "exists already".
  if (flags.out !== undefined) checkNewFile(flags.out, '--out');
  else checkWritableFolder(folder, '--out');
  if (flags.report !== false) checkFilingPlace(typeof flags.report === 'string' ? flags.report : undefined);
  say('sizing…');
  const result = sizeBank(input.scenario, input.target, input.limits, runShot);
  for (const line of describeSizing(result)) say(line);
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
  if (flags.json) process.stdout.write(`${JSON.stringify({ ...result, written }, null, 2)}\n`);
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
    .action(async (scenario: string, flags: { out?: string; json?: boolean; report?: string | boolean }) => {
      await sizeCommand(scenario, flags);
    });
}
