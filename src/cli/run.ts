/** `railpulse run <scenario>`: one shot, a terminal summary or JSON, optional waveform CSV. */
import type { Command } from 'commander';
import { loadScenarioFile } from '../scenario/load.js';
import { runShot } from '../solve/shot.js';
import { shotWarnings } from '../solve/warnings.js';
import { shotSummary } from '../output/summary.js';
import { waveformCsv } from '../output/csv.js';
import { writeFileExclusive } from '../output/files.js';
import { inFile } from './errors.js';

interface RunFlags {
  json?: boolean;
  csv?: string;
}

export function registerRun(program: Command): void {
  program
    .command('run')
    .description('simulate one shot of a scenario file')
    .argument('<scenario>', 'scenario file (JSON)')
    .option('--json', 'print the results object (SI) on stdout and nothing else')
    .option('--csv <file>', 'write the waveforms as CSV (never overwrites)')
    .action((file: string, flags: RunFlags) => {
      const loaded = loadScenarioFile(file);
      const shot = inFile(file, () => runShot(loaded.scenario));
      const warnings = shotWarnings(loaded.scenario, shot);
      if (flags.csv && shot.waveforms) writeFileExclusive(flags.csv, waveformCsv(loaded.scenario, shot.waveforms), '--csv');
      if (flags.json) {
        process.stdout.write(JSON.stringify(shot.results, null, 2) + '\n');
      } else {
        process.stdout.write(shotSummary(loaded.scenario, shot, warnings));
      }
    });
}
