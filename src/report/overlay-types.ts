/**
 * What the overlay part of a record draws of a measured shot. Declared here, by the report, so that the
 * report does not depend on the room that reads and fits measured records (src/measure): its types have
 * this shape.
 */

export const SIGNALS: Record<SignalName, { key: 'current' | 'breechVoltage' | 'muzzleVoltage'; label: string; unit: string }> = {
  I: { key: 'current', label: 'rail current I', unit: 'A' },
  V_breech: { key: 'breechVoltage', label: 'breech voltage', unit: 'V' },
  V_muzzle: { key: 'muzzleVoltage', label: 'muzzle voltage', unit: 'V' },
};

export type SignalName = 'I' | 'V_breech' | 'V_muzzle';

export interface Measurement {
  /** sample times (s), increasing */
  t: ArrayLike<number>;
  /** SI signals on the same samples */
  signals: Partial<Record<SignalName, ArrayLike<number>>>;
  source: string;
  columns: readonly { role: string; header: string; unit: string; scale: number; offset: number }[];
}

export interface PositionPoints {
  x: readonly number[];
  t: readonly number[];
  source: string;
}

export interface Comparison {
  model: number;
  measured: number;
  error: number;
  relativeError: number;
}

/** Which samples were compared: the rule at switching instants (src/measure/switching.ts). */
export interface SampleRule {
  interval: number;
  instants: readonly number[];
  /** times of the samples left out */
  excluded: readonly number[];
  /** samples outside the model's span */
  outside: number;
}

export interface GoodnessOfFit {
  signals: Partial<Record<SignalName, { rms: number; relativeRms: number; points: number }>>;
  samples?: SampleRule;
  peakCurrent?: Comparison;
  peakCurrentTime?: Comparison;
  exitTime?: Comparison;
  muzzleVelocity?: Comparison;
  arrivalTimeErrors?: readonly (number | null)[];
}

export interface OverlayFitParameter {
  value: number;
  /** NaN (null in JSON) when the parameter stopped on a bound */
  uncertainty: number;
  initial: number;
  /** SI unit symbol for display ('' for plain numbers) */
  unit: string;
}

/** A point the fit's Huber loss counted with less than full weight. */
export interface OverlayDownWeighted {
  group: string;
  /** sample time (or a block's mean time, or a probe's arrival time); null for the muzzle velocity */
  t: number | null;
  /** measured value there (SI) */
  measured: number;
  /** (model − measured)/σ */
  residual: number;
  weight: number;
}

export interface OverlayFit {
  parameters: Record<string, OverlayFitParameter>;
  /** 'pathA|pathB' → correlation coefficient */
  correlations: Record<string, number>;
  residual: { rms: number; chiSquaredReduced: number };
  shots: number;
  iterations: number;
  warnings: string[];
  /** Levenberg–Marquardt runs with the set of samples fixed */
  outerIterations: number;
  huberThreshold: number;
  /** samples per block of a decimated record (1: every sample) */
  blockSize: number;
  /** times of the samples the fit left out at switching instants */
  excluded: readonly number[];
  downWeighted: readonly OverlayDownWeighted[];
}

export interface OverlayInput {
  measurement?: Measurement;
  positions?: PositionPoints;
  /** measured figures given on the command line (SI) */
  measured: { muzzleVelocity?: number; exitTime?: number };
  goodness: GoodnessOfFit;
  fit?: OverlayFit;
  /** draw the model over the whole shot, not only over the record's span */
  wholeShot?: boolean;
}

