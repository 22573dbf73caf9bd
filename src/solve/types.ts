/**
 * The "solution" side: what a shot produces. Key names of ShotResults are the JSON output contract
 * (model contract §5); everything is SI.
 */

/** `discharged`: a ring-down into a shorted load ended, every module off or below the current floor. */
export type Outcome = 'exited' | 'stalled' | 'timeout' | 'discharged';

export const LOSS_KEYS = [
  'bank',
  'crowbar',
  'modules',
  'feed',
  'rails',
  'armature',
  'contacts',
  'arc',
  'friction',
  'drag',
] as const;
export type LossKey = (typeof LOSS_KEYS)[number];
export type Losses = Record<LossKey, number>;

export interface EnergyBudget {
  initial: number;
  capacitors: number;
  magnetic: number;
  /** ½ L(x) I², the part of the magnetic energy held by the feed and rails */
  magneticRails: number;
  /**
   * magnetic energy inside the rails' conductor, only with rail current diffusion: Σ ½ L′_n B_n of the integrated
   * cells plus ½ L′_tail x I² of the fast cells held as inductance
   */
  railInterior?: number;
  kinetic: number;
  losses: Losses;
  /** E0 − (E_cap + E_mag + E_kin + W_loss) */
  residual: number;
  /**
   * at exit only: the energy the muzzle arc (or a shunt) and the circuit's resistances share after exit, all magnetic
   * energy plus the capacitors of modules conducting or armed at exit; an upper bound on the muzzle-arc energy
   */
  afterExit?: number;
}

export interface ModuleResult {
  label: string;
  /** peak current of one module of the group (A) */
  peakCurrent: number;
  /**
   * most negative V_k / V0_k as a positive fraction, 0 if none; with a crowbar, the largest diode voltage
   * (V_D + R_D·i)/V0 across the capacitor during the crowbar stage
   */
  reversal: number;
}

export interface ShotResults {
  outcome: Outcome;
  muzzleVelocity: number;
  exitTime: number | null;
  finalPosition: number;
  peakCurrent: number;
  peakCurrentTime: number;
  peakAcceleration: number;
  peakBreechVoltage: number;
  actionIntegral: number;
  efficiency: number;
  energy: EnergyBudget;
  modules: ModuleResult[];
  /** armature transition (solid contact → arc): when and where it happened; absent when there is none */
  transitionTime?: number;
  transitionPosition?: number;
  /**
   * with heating "adiabatic": peak temperatures (°C, from 20 °C) of the armature block and of the rail surface layer at
   * the breech (the section that carries current longest), from the action through each
   */
  armatureTemperature?: number;
  railTemperature?: number;
}

export type EventKind =
  | 'trigger'
  | 'turn-on'
  | 'crowbar'
  | 'turn-off'
  | 'start'
  | 'stop'
  | 'exit'
  | 'transition'
  | 'stall'
  | 'discharged'
  | 'timeout';

export interface ShotEvent {
  t: number;
  kind: EventKind;
  /** bank group index for module events */
  group?: number;
}

/**
 * Waveforms on a uniform grid plus every event instant. Where a quantity jumps at an event instant
 * two samples share the same t (left and right limits).
 */
export interface Waveforms {
  t: number[];
  current: number[];
  /** [group][sample] total current of the group (all its modules) */
  groupCurrent: number[][];
  /** [group][sample] capacitor voltage */
  groupVoltage: number[][];
  breechVoltage: number[];
  muzzleVoltage: number[];
  position: number[];
  velocity: number[];
  acceleration: number[];
  force: number[];
  energy: {
    capacitors: number[];
    magnetic: number[];
    kinetic: number[];
    losses: Record<LossKey, number[]>;
    residual: number[];
  };
}

export interface SolverStats {
  steps: number;
  rhsEvaluations: number;
  restarts: number;
  relTol: number;
}

export interface Shot {
  results: ShotResults;
  /** null when sampling was turned off (studies) */
  waveforms: Waveforms | null;
  events: ShotEvent[];
  stats: SolverStats;
  /** ∫(F_em − F_f − F_d) dt over the moving intervals (N·s); m·v must equal it (impulse identity) */
  impulse: number;
  /** ∫ x I² dt over the in-bore phase (A²·m·s): the rails' loss over it is their loss-equivalent loop R′ */
  railAction?: number;
}
