/**
 * A solid armature as a rectangular block (metres):
 *   height — the current path across the bore, rail face to rail face (usually the rail separation s);
 *   width  — the block's extent along the rails' height (across the bore, perpendicular to the current);
 *   length — along the bore (the direction of travel).
 * The current crosses the cross-section A = width × length, so R_a = ρ·height / A and m = γ·height·width·length.
 * Real armatures (C-shaped, with trailing arms) carry current through a smaller throat: give that throat's
 * area as the current-carrying cross-section for the action check when it is known.
 */
import { InputError } from '../core/errors.js';
import type { Material } from './materials.js';

export interface ArmatureGeometry {
  height: number;
  width: number;
  length: number;
}

export interface ArmatureDerived {
  /** current-carrying cross-section A = width × length (m²) */
  currentArea: number;
  volume: number;
  /** γ·volume (kg) */
  mass: number;
  /** ρ20·height/A (Ω), at 20 °C */
  resistance: number;
}

export function deriveArmature(geometry: ArmatureGeometry, material: Material, path = 'armature.geometry'): ArmatureDerived {
  for (const key of ['height', 'width', 'length'] as const) {
    const value = geometry[key];
    if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0)
      throw new InputError(`${path}.${key}`, `expected a length greater than 0, got ${String(value)}`);
  }
  const currentArea = geometry.width * geometry.length;
  const volume = currentArea * geometry.height;
  return {
    currentArea,
    volume,
    mass: material.density * volume,
    resistance: (material.resistivity * geometry.height) / currentArea,
  };
}
