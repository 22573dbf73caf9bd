/**
 * Compare shots of several scenarios side by side: the headline figures of each, and their change against the
 * first (the baseline): a relative change, or for a quantity that is itself a percentage (efficiency) a
 * difference in percentage points. Pure: the shot function is injected.
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import { formatChange, formatPercent, formatPercentagePoints, formatQuantity, forTerminal } from '../units/format.js';
import type { RunShot } from './batch.js';

export const COMPARED_FIGURES = [
  { key: 'muzzleVelocity', label: 'muzzle velocity', unit: 'm/s', percentage: false },
  { key: 'efficiency', label: 'efficiency', unit: '%', percentage: true },
  { key: 'peakCurrent', label: 'peak current', unit: 'A', percentage: false },
  { key: 'peakAcceleration', label: 'peak acceleration', unit: 'm/s²', percentage: false },
  { key: 'actionIntegral', label: 'action integral', unit: 'A²·s', percentage: false },
  { key: 'exitTime', label: 'exit time', unit: 's', percentage: false },
] as const;

export interface ComparedShot {
  file: string;
  name: string;
  storedEnergy: number;
  results: ShotResults;
  /**
   * figure key → change against the baseline: (value − baseline) / |baseline| for most figures, value − baseline
   * (a difference of fractions, i.e. percentage points / 100) for a percentage; null for the baseline itself or when
   * undefined
   */
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
    for (const { key, percentage } of COMPARED_FIGURES) {
      const value = shot.results[key];
      const reference = baseline?.[key];
      if (i === 0 || value === null || reference === null || reference === undefined) change[key] = null;
      else if (percentage) change[key] = value - reference;
      else change[key] = reference === 0 ? null : (value - reference) / Math.abs(reference);
    }
    return { ...shot, change };
  });
}

/** A plain-text table for the terminal: one column a scenario, the change against the first in brackets. */
export function compareTable(shots: ComparedShot[]): string {
  const header = ['', ...shots.map((shot) => shot.name)];
  const rows = [
    ['stored energy', ...shots.map((shot) => formatQuantity(shot.storedEnergy, 'J'))],
    ['outcome', ...shots.map((shot) => shot.results.outcome)],
    ...COMPARED_FIGURES.map(({ key, label, unit, percentage }) => [
      label,
      ...shots.map((shot) => {
        const value = shot.results[key];
        const change = shot.change[key];
        const text = value === null ? '—' : percentage ? formatPercent(value) : formatQuantity(value, unit);
        if (change === null || change === undefined) return text;
        return `${text} (${percentage ? formatPercentagePoints(change) : formatChange(change)})`;
      }),
    ]),
  ].map((row) => row.map(forTerminal));
  const table = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...table.map((row) => row[c]!.length)));
  return table.map((row) => row.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('  ')).join('\n');
}
