/**
 * Rail resistance gradient R′ (loop: both rails) from the material and the depth the current has
 * penetrated at the pulse's characteristic time τ.
 *
 *   D = ρ / μ0                               magnetic diffusivity (m²/s)
 *   δ_eff = √(2π D τ)                        depth of the uniform layer with the same Joule loss as the
 *                                            diffused current after a step of duration τ (B = B0·erfc(x/2√(Dτ)))
 *   R′ = 2 ρ / (h · min(w, δ_eff))           rectangular rails: the current flows in a layer δ_eff deep
 *                                            behind the inner face of height h, never deeper than the rail
 *                                            width w, so R′ never falls below the DC value 2ρ/(h·w)
 *   R′ = 2 ρ / (π (a² − (a − min(a, δ_eff))²))  round rails: an annulus δ_eff deep, never below 2ρ/(πa²)
 *
 * ρ is the 20 °C value. δ_eff is the *instantaneous* depth at τ: over a pulse of length T the averaged depth is
 * about ½√(2πDT), so on a long pulse this constant overstates the loss, while young rail sections behind the
 * armature and heating raise it: neither a lower nor an upper estimate. Rectangular rails from geometry follow
 * the diffusion during the shot instead by default (./diffusion.ts).
 */
import { InputError } from '../core/errors.js';
import type { RailGeometry } from './inductance.js';
import type { Material } from './materials.js';

const MU0 = 4e-7 * Math.PI;

/** Magnetic diffusivity D = ρ/μ0 (m²/s) of a non-magnetic conductor. */
export function magneticDiffusivity(resistivity: number): number {
  return resistivity / MU0;
}

/** Equivalent uniform current layer √(2π D τ) after time τ (m). */
export function penetrationDepth(resistivity: number, time: number): number {
  return Math.sqrt(2 * Math.PI * magneticDiffusivity(resistivity) * time);
}

/** Cross-section that carries the current in one rail after time τ (m²). */
export function currentCarryingArea(geometry: RailGeometry, resistivity: number, time: number): number {
  const depth = penetrationDepth(resistivity, time);
  if (geometry.kind === 'rectangular') return geometry.height * Math.min(geometry.width, depth);
  const a = geometry.radius;
  const inner = a - Math.min(a, depth);
  return Math.PI * (a * a - inner * inner);
}

/** Loop resistance gradient R′ of both rails (Ω/m) at characteristic time τ (s); see the module comment. */
export function resistanceGradientOf(geometry: RailGeometry, material: Material, time: number, path = 'rails'): number {
  if (!(time > 0) || !Number.isFinite(time)) throw new InputError(`${path}.characteristicTime`, `expected a time greater than 0, got ${time}`);
  return (2 * material.resistivity) / currentCarryingArea(geometry, material.resistivity, time);
}

/** DC loop resistance gradient 2ρ/A of both rails (Ω/m). */
export function resistanceGradientDC(geometry: RailGeometry, material: Material): number {
  const area = geometry.kind === 'rectangular' ? geometry.height * geometry.width : Math.PI * geometry.radius ** 2;
  return (2 * material.resistivity) / area;
}

/** Quarter period of an undamped LC discharge, (π/2)·√(L·C): the time to peak current (s). */
export function quarterPeriod(inductance: number, capacitance: number): number {
  return (Math.PI / 2) * Math.sqrt(inductance * capacitance);
}

export interface BankGroupForTiming {
  count: number;
  /** per module (F) */
  capacitance: number;
  /** per module (H) */
  inductance: number;
}

/**
 * Characteristic time τ of a bank firing into a load: the quarter period with every group fired together,
 * C_total = Σ n·C_k, L_total = 1/Σ(n/L_k) + externalInductance (feed, plus whatever rail inductance the
 * caller counts, e.g. L′ at the armature's start position). A staggered (delayed-trigger) bank stretches
 * the pulse; then this is the time scale of one stage, a short and therefore conservative τ for R′.
 */
export function bankCharacteristicTime(groups: readonly BankGroupForTiming[], externalInductance: number): number {
  let capacitance = 0;
  let inverseInductance = 0;
  for (const g of groups) {
    capacitance += g.count * g.capacitance;
    inverseInductance += g.count / g.inductance;
  }
  return quarterPeriod(1 / inverseInductance + externalInductance, capacitance);
}
