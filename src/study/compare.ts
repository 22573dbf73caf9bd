/**
 * Compare shots of several scenarios side by side: the headline figures of each, and their change relative to the
 * first (the baseline). Pure: the shot function is injected.
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import type { RunShot } from './batch.js';

export const COMPARED_FIGURES = [
  { key: 'muzzleVelocity', label: 'muzzle velocity', unit: 'm/s', scale: 1 },
  { key: 'efficiency', label: 'efficiency', unit: '%', scale: 100 },
  { key: 'peakCurrent', label: 'peak current', unit: 'kA', scale: 1e-3 },
  { key: 'peakAcceleration', label: 'peak acceleration', unit: 'km/s²', scale: 1e-3 },
  { key: 'actionIntegral', label: 'action integral', unit: 'A²·s', scale: 1 },
  { key: 'exitTime', label: 'exit time', unit: 'ms', scale: 1e3 },
] as const;

export interface ComparedShot {
  file: string;
  name: string;
  storedEnergy: number;
  results: ShotResults;
  /** figure key → (value − baseline) / baseline; null for the baseline itself or when undefined */
  change: Record<string, number | null>;
}

export function compareScenarios(entries: { file: string; scenario: Scenario }[], runShot: RunShot): ComparedShot[] {
  const shots = entries.map(({ file, scenario }) => ({
    file,
    name: scenario.name,
    storedEnergy: scenario.bank.reduce((sum, group) => sum + 0.5 * group.count * group.capacitance * group.voltage ** 2, 0),
    results: runShot(scenario, { waveforms: false }).results,
  }));
  const baseline = shots[0]?.results;
  return shots.map((shot, i) => {
    const change: Record<string, number | null> = {};
    for (const { key } of COMPARED_FIGURES) {
      const value = shot.results[key];
      const reference = baseline?.[key];
      change[key] = i === 0 || value === null || reference === null || reference === undefined || reference === 0 ? null : (value - reference) / Math.abs(reference);
    }
    return { ...shot, change };
  });
}

/** A plain-text table for the terminal: one column a scenario, change against the first in brackets. */
export function compareTable(shots: ComparedShot[]): string {
  const header = ['', ...shots.map((shot) => shot.name)];
  const rows = [
    ['stored energy (kJ)', ...shots.map((shot) => (shot.storedEnergy / 1e3).toPrecision(4))],
    ['outcome', ...shots.map((shot) => shot.results.outcome)],
    ...COMPARED_FIGURES.map(({ key, label, unit, scale }) => [
      `${label} (${unit})`,
      ...shots.map((shot) => {
        const value = shot.results[key];
        const change = shot.change[key];
        const text = value === null ? '—' : (value * scale).toPrecision(4);
        return change === null || change === undefined ? text : `${text} (${change >= 0 ? '+' : ''}${(100 * change).toFixed(1)} %)`;
      }),
    ]),
  ];
  const table = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...table.map((row) => row[c]!.length)));
  return table.map((row) => row.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('  ')).join('\n');
}
