/** `railpulse index [DIR]`: the archive index of the shot records in a folder. */
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Command } from 'commander';
import { InputError } from '../core/errors.js';
import { buildArchiveIndex, isArchiveIndex, scanReports } from '../report/archive.js';
import { checkReplaceable, replaceOwnFile } from '../output/write.js';
import { DEFAULT_REPORT_DIR } from '../pipeline/record.js';

export function registerIndex(program: Command): void {
  program
    .command('index')
    .description('write DIR/index.html: one sortable, filterable row per shot record in DIR')
    .argument('[dir]', 'folder of reports', DEFAULT_REPORT_DIR)
    .action((dir: string) => {
      if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new InputError('index', `${dir} is not a folder of reports`);
      const target = join(dir, 'index.html');
      // The index is a view rebuilt from the records each time, so it may replace the index it wrote before, but
      // never an index.html of anyone else (checked before the records are read, and again at the rename).
      checkReplaceable(target, isArchiveIndex, 'index');
      const scan = scanReports(dir);
      for (const warning of scan.warnings) process.stderr.write(`railpulse: skipped ${warning}\n`);
      replaceOwnFile(target, buildArchiveIndex(scan.entries), isArchiveIndex, 'index');
      process.stdout.write(`${target}: ${scan.entries.length} record${scan.entries.length === 1 ? '' : 's'}\n`);
    });
}
