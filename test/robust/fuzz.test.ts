/**
 * Property-based robustness (fast-check): over 10,000 generated scenarios and corruptions a run, no input makes
 * railpulse fail as an internal error (exit 1) or print a stack trace, every problem is one line, and every valid
 * scenario's shot closes its energy ledger to 1e-6 of the stored energy (model contract §4).
 *
 * In-process: the functions the CLI calls for `run` (loadScenarioText, shoot, resultsJson) with the CLI's own
 * classification of errors (classifyError: exit 2 for input, 1 for anything else). Then a sample through real CLI
 * processes, for what only a process shows (stderr, exit code).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { classifyError, EXIT } from '../../src/core/errors.js';
import { resultsJson, shoot } from '../../src/pipeline/shoot.js';
import { loadScenarioText } from '../../src/scenario/load.js';
import { corruptedText, hostileScenarioText, realisticScenario } from './arbitraries.js';

const SEED = Number(process.env.RAILPULSE_FUZZ_SEED ?? 20261202);
const LEDGER = 1e-6;

interface Outcome {
  code: number;
  line: string;
  residual?: number;
  initial?: number;
}

/** What `railpulse run FILE --json --no-report` does with a file's text, in-process. */
function runText(text: string): Outcome {
  try {
    const loaded = loadScenarioText(text, 'fuzz.json');
    const assessed = shoot(loaded, { waveforms: false });
    const json = JSON.stringify(resultsJson(assessed));
    if (json.length === 0) throw new Error('empty results');
    const { energy } = assessed.shot.results;
    return { code: EXIT.ok, line: '', residual: energy.residual, initial: energy.initial };
  } catch (error) {
    return classifyError(error);
  }
}

function expectHandled(outcome: Outcome, text: string): void {
  if (outcome.code === EXIT.internal) throw new Error(`internal error for input ${JSON.stringify(text.slice(0, 400))}: ${outcome.line}`);
  expect(outcome.line).not.toContain('\n');
  if (outcome.code === EXIT.ok) {
    expect(Number.isFinite(outcome.residual)).toBe(true);
    expect(Math.abs(outcome.residual!)).toBeLessThanOrEqual(LEDGER * outcome.initial!);
  }
}

describe('fuzz: generated scenarios and corruptions (fast-check)', () => {
  let total = 0;

  it('3,000 realistic scenarios all run and close their ledger to 1e-6 of E0', () => {
    let shots = 0;
    fc.assert(
      fc.property(realisticScenario, (scenario) => {
        const text = JSON.stringify(scenario);
        const outcome = runText(text);
        expectHandled(outcome, text);
        // a realistic scenario is valid: it must shoot (an integration failure here would be a defect to find)
        if (outcome.code !== EXIT.ok) throw new Error(`valid scenario refused: ${outcome.line}\n${text}`);
        shots += 1;
      }),
      { numRuns: 3_000, seed: SEED },
    );
    total += shots;
    expect(shots).toBe(3_000);
  });

  it('4,500 scenarios with hostile values: exit 0 or 2, never 1, one line each', () => {
    const codes = new Map<number, number>();
    fc.assert(
      fc.property(hostileScenarioText, (text) => {
        const outcome = runText(text);
        expectHandled(outcome, text);
        codes.set(outcome.code, (codes.get(outcome.code) ?? 0) + 1);
      }),
      { numRuns: 4_500, seed: SEED + 1 },
    );
    total += 4_500;
    // most hostile edits are refused, some (a sensible value drawn at random) still shoot
    expect(codes.get(EXIT.input) ?? 0).toBeGreaterThan(2_000);
  });

  it('2,500 corrupted files: exit 0 or 2, never 1, one line each', () => {
    fc.assert(
      fc.property(corruptedText, (text) => {
        expectHandled(runText(text), text);
      }),
      { numRuns: 2_500, seed: SEED + 2 },
    );
    total += 2_500;
    expect(total).toBeGreaterThanOrEqual(10_000);
  });

  it('a sample through the real command: exit 0 or 2, no stack trace, one line on stderr for bad input', () => {
    const dir = mkdtempSync(join(tmpdir(), 'railpulse-fuzz-'));
    const texts = [
      ...fc.sample(hostileScenarioText, { numRuns: 16, seed: SEED + 3 }),
      ...fc.sample(corruptedText, { numRuns: 16, seed: SEED + 4 }),
      ...fc.sample(realisticScenario.map((s) => JSON.stringify(s)), { numRuns: 4, seed: SEED + 5 }),
    ];
    texts.forEach((text, n) => {
      const file = join(dir, `case-${n}.json`);
      writeFileSync(file, text);
      const result = spawnSync(process.execPath, ['bin/railpulse.js', 'run', file, '--json', '--no-report'], { encoding: 'utf8', timeout: 120_000 });
      const context = `case ${n}: ${text.slice(0, 200)}\nstderr: ${result.stderr}`;
      expect([EXIT.ok, EXIT.input], context).toContain(result.status);
      expect(result.stderr, context).not.toMatch(/\n\s+at |internal error/);
      if (result.status === EXIT.input) {
        expect(result.stderr.trimEnd().split('\n'), context).toHaveLength(1);
        expect(result.stdout).toBe('');
        // the same classification as in-process
        expect(runText(text).code, context).toBe(EXIT.input);
      }
    });
  }, 600_000);
});
