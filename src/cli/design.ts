/**
 * `railpulse design <scenario>`: write the design page of a scenario, an offline page that simulates in the
 * browser (src/design/). Wiring only.
 */
import type { Command } from 'commander';
import { checkFilingPlace, DEFAULT_REPORT_DIR } from '../pipeline/record.js';
import { writeDesignPage } from '../design/page.js';
import { loadScenarioFile } from '../scenario/load.js';

export function registerDesignCommand(program: Command): void {
  program
    .command('design')
    .description('write a self-contained design page for a scenario: change any value in the browser and see the shot again at once')
    .argument('<scenario>', 'scenario file (JSON)')
    .option('-o, --output <path>', `where to write the page: a folder, or a new file ending in .html (default: ${DEFAULT_REPORT_DIR}/)`)
    .action((file: string, flags: { output?: string }) => {
      checkFilingPlace(flags.output, '--output');
      const path = writeDesignPage(loadScenarioFile(file), flags.output);
      process.stdout.write(`design page: ${path}\n`);
    });
}
