/**
 * Current diffusion into rectangular rails during the shot, as a ladder the shot model integrates.
 *
 * Each rail is a 1-D slab w thick (normal to its inner face) and h high, driven at the inner face by the surface
 * current I/h, with no field behind it. Its internal impedance per unit length is [derived: magnetic diffusion
 * ∂H/∂t = D ∂²H/∂x² with D = ρ/μ0, H(0) = I/h, H(w) = 0]
 *
 *   Z(s) = ρ/(h w) · (k w) coth(k w),      k = √(s μ0/ρ)
 *
 * and the partial-fraction (Foster) expansion x coth x = 1 + Σ_{n≥1} 2x²/(x² + n²π²) [published: the Mittag-Leffler
 * expansion of coth, e.g. Abramowitz & Stegun 4.5.70] turns it into a DC resistance in series with parallel R–L cells:
 *
 *   Z(s) = ρ/(h w) + Σ_n R_n · s/(s + λ_n),   R_n = 2ρ/(h w),   λ_n = D (nπ/w)²,   L_n = R_n/λ_n.
 *
 * Limits: s → 0 gives ρ/(h w), the uniform-current value, the floor; s → ∞ gives the surface impedance ρk/h
 * (skin depth); Σ L_n = μ0 w/(3h), the internal inductance of a uniform current. Modes far faster than the shot
 * (λ_n above `maxRate`) are kept as their inductance only (the "tail"): a cell with λ ≫ s carries the whole current.
 * All figures here are loop values (both rails).
 *
 * A real rail is not driven over its inner face alone: at high frequency the current spreads over its whole
 * perimeter with the perfect-conductor distribution. `railDiffusionOf` therefore gives the slab the face width
 * h_eff of that distribution (the uniform sheet with the same loss, from the boundary-element solution) and the
 * depth A/h_eff, so that both limits are exact for the real cross-section: the thin-skin resistance ρ/(δ h_eff)
 * and the uniform-current resistance ρ/A; between them the 1-D slab is an approximation.
 */
import { InputError } from '../core/errors.js';

const MU0 = 4e-7 * Math.PI;

export interface DiffusionMode {
  /** loop R′_n of the cell (Ω/m) */
  resistanceGradient: number;
  /** λ_n = R_n/L_n (1/s) */
  rate: number;
}

export interface RailDiffusion {
  /** face width and depth of the equivalent slab (m) */
  face: number;
  depth: number;
  /** loop DC resistance 2ρ/(h w) (Ω/m) */
  resistanceGradientDC: number;
  /** the integrated cells, slowest first */
  modes: DiffusionMode[];
  /** Σ L′_n of the cells faster than maxRate (loop, H/m): held as inductance */
  tailInductanceGradient: number;
}

/** Most cells integrated: each costs two states. */
export const MAX_DIFFUSION_MODES = 24;

/** Cells 1..∞ of the slab: loop R′_n and λ_n; the tail's inductance is Σ_{n>N} L_n = μ0 w/(3h) − Σ_{n≤N} L_n. */
export function railDiffusion(height: number, width: number, resistivity: number, maxRate: number, path = 'rails'): RailDiffusion {
  if (!(height > 0 && width > 0 && resistivity > 0)) throw new InputError(`${path}.geometry`, 'current diffusion needs a positive rail height, width and resistivity');
  if (!(maxRate > 0)) throw new InputError(path, `current diffusion needs a positive fastest rate, got ${maxRate}`);
  const diffusivity = resistivity / MU0;
  const cell = (4 * resistivity) / (height * width);
  const modes: DiffusionMode[] = [];
  let kept = 0;
  for (let n = 1; n <= MAX_DIFFUSION_MODES; n++) {
    const rate = diffusivity * ((n * Math.PI) / width) ** 2;
    if (rate > maxRate) break;
    modes.push({ resistanceGradient: cell, rate });
    kept += cell / rate;
  }
  const total = (2 * MU0 * width) / (3 * height);
  return { face: height, depth: width, resistanceGradientDC: (2 * resistivity) / (height * width), modes, tailInductanceGradient: Math.max(0, total - kept) };
}

/** The ladder of a rectangular rail of cross-section `area` whose high-frequency current spreads over `currentWidth`. */
export function railDiffusionOf(area: number, currentWidth: number, resistivity: number, maxRate: number, path = 'rails'): RailDiffusion {
  return railDiffusion(currentWidth, area / currentWidth, resistivity, maxRate, path);
}

/**
 * Fastest cell integrated by default, in units of the shot's characteristic time τ (the bank's quarter period):
 * λ_N ≤ 2/τ (`solver.diffusionRate` changes it). A faster cell follows the current closely, so it is kept as its
 * inductance plus the loss of being born empty at the armature (½ L′_n v I²); what that leaves out is its loss
 * R_n (dI/dt / λ_n)². odex is explicit, so every cell kept bounds the step size by about 1/λ_N. Measured: on the
 * geometry demo (crowbarred, young rail sections dominate) the rail loss differs by 7e-4 from cells up to 40/τ,
 * at 15 against 169 steps; on a ringing bank without crowbars on the same rails it is 9 % low (3 % with 4/τ); in
 * sinusoidal steady state at the quarter-period frequency the truncated ladder's resistance is about 20 % below the
 * exact slab's (7 % with 4/τ).
 */
export const FASTEST_RATE_TIMES_TAU = 2;
