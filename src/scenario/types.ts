import type { RailGeometry } from '../conductors/inductance.js';
import type { Material } from '../conductors/materials.js';
import type { RailsDerived } from '../conductors/rails.js';
import type { RailDiffusion } from '../conductors/diffusion.js';
import type { ArmatureDerived, ArmatureGeometry } from '../conductors/armature.js';
import type { EngineeringLimits } from './limits.js';

/**
 * A scenario after loading: every quantity a plain SI number, every default filled in.
 * This is the "problem" that the solver reads; nothing downstream sees unit strings.
 */

export interface Crowbar {
  /** diode forward drop V_D (V) */
  drop: number;
  /** diode on-resistance R_D (ohm), per module */
  resistance: number;
}

/** A group of `count` identical modules fired together. Values are per module. */
export interface ModuleGroup {
  label: string;
  count: number;
  /** C (F) per module */
  capacitance: number;
  /** V0 (V), > 0 */
  voltage: number;
  /** R_esr (ohm) per module */
  esr: number;
  /** L_k (H) per module, > 0 */
  inductance: number;
  /** R_k (ohm) per module, outside the crowbar loop */
  resistance: number;
  /** trigger time t_k (s) */
  trigger: number;
  crowbar: Crowbar | null;
  /** rated voltage reversal as a fraction of the charge voltage (checks only) */
  ratedReversal?: number;
}

/**
 * A shorted load in place of rails and armature: the bank fired into a short at the breech, as labs do to
 * characterise a bank by its ring-down. `inductance` and `resistance` are the short's own (a shorting bar,
 * a dummy load); the feed keeps its own values, so a ring-down's fitted feed and module values carry into a
 * launch scenario of the same bank.
 */
export interface ShortedLoad {
  kind: 'short';
  /** the short's own inductance (H), ≥ 0 */
  inductance: number;
  /** the short's own resistance (ohm), ≥ 0 */
  resistance: number;
}

export interface Feed {
  inductance: number;
  resistance: number;
}

export interface Rails {
  length: number;
  /** L' (H/m) */
  inductanceGradient: number;
  /** R' (ohm/m), loop resistance of both rails per metre of travel */
  resistanceGradient: number;
  /** rail cross-section, when the scenario gave one */
  geometry?: RailGeometry;
  material?: Material;
  /** what the geometry gave (both L' values, R'), when it was given */
  derived?: RailsDerived;
  /**
   * current diffusion into the rails during the shot (rectangular rails from geometry and material, no number for
   * R′): the model adds its cells to resistanceGradient, which then holds the DC value 2ρ/(h w)
   */
  diffusion?: RailDiffusion;
  /**
   * with rails from geometry, where R′ came from: current diffusion during the shot, the constant at the bank's
   * quarter period, a number the file gave, or none (no material and no number: R′ = 0)
   */
  resistanceSource?: 'diffusion' | 'quarter-period' | 'given' | 'none';
}

/**
 * Armature transition: the solid contact turns into an arc once the action through it, ∫I²dt, reaches
 * specificAction·contactArea² (a specific action of the contact, A²·s/m⁴); from then on the arc drop applies and
 * the solid contact resistance no longer does.
 */
export interface ArmatureTransition {
  /** specific action of the contact at which it turns into an arc (A²·s/m⁴) */
  specificAction: number;
  /** the contact area that carries the current (m²) */
  contactArea: number;
  /** arc drop after the transition (V) */
  arcDrop: number;
  /** specificAction·contactArea² (A²·s) */
  action: number;
}

export interface Armature {
  mass: number;
  /** initial distance from the breech x0 (m) */
  position: number;
  resistance: number;
  contactResistance: number;
  arcDrop: number;
  transition?: ArmatureTransition;
  geometry?: ArmatureGeometry;
  material?: Material;
  /** cross-section, volume, mass and resistance from geometry and material */
  derived?: ArmatureDerived;
}

export interface Friction {
  coefficient: number;
  staticCoefficient: number;
  /** preload normal force F_N0 (N) */
  preload: number;
  /** k_N (N/A^2): magnetic contribution to the contact normal force */
  magneticLoading: number;
}

export interface Drag {
  gasDensity: number;
  /** C_d of ½ρC_dA v²; with the strong-shock model, γ + 1 (the same force law) */
  dragCoefficient: number;
  boreArea: number;
  /** "strong-shock": the gas column ahead is pushed by a strong shock, pressure (γ+1)/2·ρ0·v² */
  model?: 'strong-shock';
  /** ratio of specific heats γ of the gas ahead (strong-shock model only) */
  heatCapacityRatio?: number;
}

/**
 * Adiabatic heating during the shot (scenario `heating: "adiabatic"`): each conductor's resistance grows as
 * exp(κ·S) with κ = ρ0α/(A²γc) and S the action through it (0: that conductor is not heated).
 */
export interface Heating {
  armature: number;
  rails: number;
  /** temperature coefficients α (1/K) of the heated materials, for the reported temperatures */
  armatureAlpha: number;
  railAlpha: number;
}

export interface SolverOptions {
  relTol: number;
  endTime: number;
  /** uniform waveform sample interval (s); 0 = no uniform samples (events only) */
  sampleInterval: number;
  /** stall current floor per module (A) */
  currentFloor: number;
  /** bound on accepted integration steps for the whole shot (never a hang) */
  maxSteps: number;
  /** rail current diffusion: fastest cell integrated, λ·τ (default FASTEST_RATE_TIMES_TAU) */
  diffusionRate?: number;
}

/** How the lab files a shot (scenario `record` section); text only, no effect on the simulation. */
export interface ShotFiling {
  shotId?: string;
  operator?: string;
  reviewer?: string;
  notes?: string;
}

export interface Scenario {
  name: string;
  description: string;
  /** present when the scenario has a `record` section */
  record?: ShotFiling;
  bank: ModuleGroup[];
  feed: Feed;
  rails: Rails;
  armature: Armature;
  friction: Friction;
  drag: Drag | null;
  /** adiabatic heating of the armature and rails during the shot; absent = none */
  heating?: Heating;
  /**
   * A shorted load (ring-down) instead of rails and armature; absent for a launch. With a short, `rails`,
   * `armature` and `friction` hold zeros and are not used (the file may not give them).
   */
  load?: ShortedLoad;
  solver: SolverOptions;
  /** engineering-check thresholds given by the scenario (the rest are defaults) */
  limits?: Partial<EngineeringLimits>;
  /** the scenario's own tolerances (`tolerances` section), when it has any */
  tolerances?: Tolerance[];
  /** the calibration the scenario carries (`calibration` section, written by `railpulse fit`) */
  calibration?: Calibration;
}

/**
 * A scenario value an uncertainty moves, and the values that move with it: a path whose default follows another
 * (friction.staticCoefficient defaults to μ) moves by the same amount when the file leaves it to that default.
 */
export interface UncertainTarget {
  path: string;
  follows: string[];
}

/** One entry of the `tolerances` section, in SI. */
export interface Tolerance {
  /** where it was written, e.g. `tolerances[2]` (for messages) */
  where: string;
  /** the path as written: a scenario path, or `bank[*].…` for every group */
  path: string;
  /** uniform over ±spread, or normal with σ = spread */
  distribution: 'uniform' | 'normal';
  /** half-width a (uniform) or σ (normal): SI, or a fraction of the value when `relative` */
  spread: number;
  relative: boolean;
  /** a bank[*] path: one draw moves every group together (e.g. one charger) instead of one draw a group */
  common: boolean;
  /** the concrete paths it moves (a wildcard expanded; a calibrated group left to the calibration) */
  targets: UncertainTarget[];
}

/** The `calibration` section: fitted values with their joint covariance, and the record they came from. */
export interface Calibration {
  parameters: UncertainTarget[];
  /** fitted values (SI), equal to the scenario's values at those paths */
  values: number[];
  /** covariance of the fitted values (SI), symmetric positive semi-definite */
  covariance: number[][];
  /** the measured record fitted, its SHA-256 and the date of the fit */
  record: string;
  recordSha256: string;
  date: string;
  /** the scenario file that was calibrated */
  scenario?: string;
  chiSquaredReduced?: number;
  /** parameters the fit left on a bound: fitted, but with no uncertainty the fit could give */
  onBound: string[];
}
