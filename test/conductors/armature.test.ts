import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { deriveArmature } from '../../src/conductors/armature.js';
import { getMaterial } from '../../src/conductors/materials.js';

describe('armature from geometry', () => {
  it('a 20 × 10 × 15 mm aluminium 6061-T6 block: R = ρ·path/A, m = γ·V (Ohm’s law for a uniform bar)', () => {
    const alloy = getMaterial('aluminium-6061-t6');
    const derived = deriveArmature({ height: 0.02, width: 0.01, length: 0.015 }, alloy);
    expect(derived.currentArea).toBeCloseTo(1.5e-4, 15);
    expect(derived.mass).toBeCloseTo(2700 * 3e-6, 12);
    expect(derived.resistance).toBeCloseTo((alloy.resistivity * 0.02) / 1.5e-4, 15);
  });

  it('a zero or negative size names its path', () => {
    const copper = getMaterial('copper');
    for (const key of ['height', 'width', 'length'] as const) {
      const geometry = { height: 0.02, width: 0.01, length: 0.015, [key]: 0 };
      try {
        deriveArmature(geometry, copper);
        throw new Error('expected an InputError');
      } catch (error) {
        expect(error).toBeInstanceOf(InputError);
        expect((error as InputError).where).toBe(`armature.geometry.${key}`);
      }
    }
  });
});
