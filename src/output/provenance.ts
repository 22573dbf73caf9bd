/** Provenance of a shot record: which tool, which Node, which input, when. */
import { sha256Text } from '../core/sha256.js';
import type { Shot } from '../solve/types.js';
import { TOOL_VERSION } from '../version.js';

/** Which tool, which Node, which input and when: the provenance every record and result carries. */
export interface ShotProvenance {
  toolVersion: string;
  nodeVersion: string;
  /** ISO 8601; under SOURCE_DATE_EPOCH a fixed date */
  date: string;
  scenarioSha256: string;
  relTol: number;
  steps: number;
  rhsEvaluations: number;
}

/** The report date: now, or SOURCE_DATE_EPOCH (seconds) for reproducible builds of a record. */
export function reportDate(): string {
  const epoch = process.env.SOURCE_DATE_EPOCH;
  if (epoch && /^\d+$/.test(epoch)) return new Date(Number(epoch) * 1000).toISOString();
  return new Date().toISOString();
}

/** Where a shot ran, for its provenance: a runtime name in the `nodeVersion` slot and an ISO 8601 date. */
export interface RunEnvironment {
  runtime: string;
  date: string;
}

/** The provenance of a shot; `environment` defaults to this Node process and now (the design page names its browser). */
export function provenanceOf(shot: Shot, scenarioSha256: string, environment?: RunEnvironment): ShotProvenance {
  return {
    toolVersion: TOOL_VERSION,
    nodeVersion: environment ? environment.runtime : process.version,
    date: environment ? environment.date : reportDate(),
    scenarioSha256,
    relTol: shot.stats.relTol,
    steps: shot.stats.steps,
    rhsEvaluations: shot.stats.rhsEvaluations,
  };
}

/** Short hash of the scenario and the tool version: the same input under the same tool gets the same tag. */
export function recordTag(scenarioSha256: string): string {
  return sha256Text(`${scenarioSha256}\n${TOOL_VERSION}`).slice(0, 8);
}

export function sha256(text: string): string {
  return sha256Text(text);
}
