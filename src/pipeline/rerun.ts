/**
 * Re-running an archived record: the scenario embedded in a shot record is loaded like any scenario file,
 * shot again, and its results compared with the archived ones.
 */
import { readFileSync } from 'node:fs';
import { compareResults } from '../output/rerun.js';
import { NotAReportError, readEmbedded } from '../report/embedded.js';
import { loadScenarioText, type LoadedScenario } from '../scenario/load.js';
import { InputError } from '../core/errors.js';
import { MAX_JSON_DEPTH } from '../scenario/jsonError.js';
import { nestingDepth } from '../scenario/source.js';
import type { AssessedShot } from './shoot.js';

export interface RerunVerdict {
  /** the archived and new results agree to the comparison's tolerance */
  matches: boolean;
  /** one line saying how they compare */
  line: string;
}

/** Load the scenario archived in `reportFile`, shoot it with `shootLoaded`, and compare. */
export function rerunRecord(reportFile: string, shootLoaded: (loaded: LoadedScenario) => AssessedShot): RerunVerdict {
  let html: string;
  try {
    html = readFileSync(reportFile, 'utf8');
  } catch (error) {
    throw new InputError('--from-report', `cannot read ${reportFile} (${(error as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  let archived;
  try {
    archived = readEmbedded(html);
  } catch (error) {
    if (error instanceof NotAReportError) throw new InputError('--from-report', `${reportFile} is not a railpulse shot report (${error.message})`);
    throw error;
  }
  // A record is a file anyone can edit: data nested deeper than any record holds would overflow the stack below.
  if (nestingDepth(archived.scenarioRaw) > MAX_JSON_DEPTH || nestingDepth(archived.results) > MAX_JSON_DEPTH) {
    throw new InputError('--from-report', `${reportFile}: its embedded data is nested deeper than ${MAX_JSON_DEPTH} levels; not a railpulse record`);
  }
  const source = JSON.stringify(archived.scenarioRaw, null, 2);
  const read = loadScenarioText(source, `${reportFile} (archived scenario)`);
  // The archived scenario is the file the record was made from: a record of the re-run carries that file's hash
  // (and so the same tag in its name), not the hash of our re-serialised copy.
  const archivedHash = archived.provenance.scenarioSha256;
  const loaded: LoadedScenario = typeof archivedHash === 'string' && /^[0-9a-f]{64}$/.test(archivedHash) ? { ...read, sha256: archivedHash } : read;
  const { shot } = shootLoaded(loaded);
  const verdict = compareResults(archived.results, shot.results);
  const line = verdict.identical
    ? `re-run of ${reportFile}: results identical to the archived record (${verdict.compared} figures; archived by railpulse ${archived.provenance.toolVersion})`
    : verdict.matches
      ? `re-run of ${reportFile}: results match the archived record to ${verdict.largestRelativeDifference.toExponential(1)} (relative)`
      : `re-run of ${reportFile}: results DIFFER from the archived record (railpulse ${archived.provenance.toolVersion}): ` +
        verdict.differences.slice(0, 6).map((d) => `${d.path} ${String(d.archived)} → ${String(d.now)}`).join('; ');
  return { matches: verdict.matches, line };
}
