/**
 * Everything the rails' geometry and material give the shot model, gathered for the scenario loader and
 * the JSON output (`railsDerived`). Which L′ to run a shot with is the caller's choice: the high-frequency
 * value is the usual one for a pulsed gun (see ./inductance.ts).
 */
import { inductanceGradientOf, type InductanceGradient, type RailGeometry } from './inductance.js';
import type { Material } from './materials.js';
import { penetrationDepth, resistanceGradientDC, resistanceGradientOf } from './resistance.js';

export interface RailsDerived extends InductanceGradient {
  /** τ used for the current penetration (s), null without a material */
  characteristicTime: number | null;
  /** √(2π ρ τ/μ0) (m) */
  penetrationDepth: number | null;
  /** loop R′ at τ (Ω/m) */
  resistanceGradient: number | null;
  /** loop R′ with uniform current (Ω/m), the lower bound */
  resistanceGradientDC: number | null;
}

export function deriveRails(geometry: RailGeometry, material: Material | undefined, characteristicTime: number | undefined, path = 'rails'): RailsDerived {
  const inductance = inductanceGradientOf(geometry, `${path}.geometry`);
  const withMaterial = material !== undefined && characteristicTime !== undefined;
  return {
    ...inductance,
    characteristicTime: withMaterial ? characteristicTime : null,
    penetrationDepth: withMaterial ? penetrationDepth(material.resistivity, characteristicTime) : null,
    resistanceGradient: withMaterial ? resistanceGradientOf(geometry, material, characteristicTime, path) : null,
    resistanceGradientDC: material ? resistanceGradientDC(geometry, material) : null,
  };
}
