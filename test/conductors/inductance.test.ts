import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { inductanceGradientOf, INDUCTANCE_TOLERANCE, railGeometryFromObject, rectangularRailPanels, type RailGeometry } from '../../src/conductors/inductance.js';
import { extrapolate } from '../../src/conductors/richardson.js';
import { gradedSegment, loopInductanceFromPanels, panelLogIntegral } from '../../src/conductors/bem.js';
import { logGeometricMeanDistance, logGeometricMeanDistanceByQuadrature, logDistanceRatioOfBars } from '../../src/conductors/gmd.js';

const MU0 = 4e-7 * Math.PI;
const relative = (a: number, b: number) => Math.abs(a / b - 1);

describe('boundary-element building blocks', () => {
  it('the exact panel log integral matches a fine midpoint quadrature (numerical check)', () => {
    const panel = { x0: 0.2, y0: -0.1, x1: 1.1, y1: 0.4 };
    for (const [px, py] of [[0.3, 0.7], [2, -1], [0.65, 0.2]] as const) {
      const n = 200000;
      let sum = 0;
      const len = Math.hypot(0.9, 0.5);
      for (let k = 0; k < n; k++) {
        const t = (k + 0.5) / n;
        sum += Math.log(Math.hypot(px - (0.2 + 0.9 * t), py - (-0.1 + 0.5 * t)));
      }
      expect(panelLogIntegral(px, py, panel)).toBeCloseTo((sum * len) / n, 6);
    }
  });

  it('self term of a panel is ℓ(ln(ℓ/2) − 1) (closed form of ∫ ln|s| ds)', () => {
    const panel = { x0: 0, y0: 0, x1: 0.3, y1: 0.4 };
    expect(panelLogIntegral(0.15, 0.2, panel)).toBeCloseTo(0.5 * (Math.log(0.25) - 1), 12);
  });

  it('a coarse uniform polygon already approximates the two-wire line (exact two-wire line, transmission-line texts)', () => {
    const panels = gradedSegment(2, 0, 2, 0, 1, 1).length; // one panel
    expect(panels).toBe(1);
    const polygon = Array.from({ length: 64 }, (_, k) => {
      const a0 = (Math.PI * k) / 64;
      const a1 = (Math.PI * (k + 1)) / 64;
      return { x0: 2 + Math.cos(a0), y0: Math.sin(a0), x1: 2 + Math.cos(a1), y1: Math.sin(a1) };
    });
    expect(relative(loopInductanceFromPanels(polygon), (MU0 / Math.PI) * Math.acosh(2))).toBeLessThan(2e-3);
  });
});

describe('Richardson extrapolation', () => {
  it('recovers the limit of L* + C·h^p exactly for uneven refinement ratios (Richardson, numerical analysis texts)', () => {
    for (const p of [1, 1.5, 2, 3]) {
      const level = (n: number) => ({ value: 2 + 0.7 * n ** -p, elements: n });
      expect(extrapolate(level(16), level(25), level(37))).toBeCloseTo(2, 10);
    }
  });
  it('refuses a sequence that does not converge monotonically', () => {
    expect(extrapolate({ value: 1, elements: 10 }, { value: 2, elements: 15 }, { value: 1.5, elements: 22 })).toBeUndefined();
  });
});

describe('high-frequency L′ of round rails', () => {
  it.each([
    [1, 2.1],
    [1, 3],
    [5e-3, 25e-3],
    [1, 10],
    [2e-3, 0.15],
  ])('radius %s, centre distance %s: equals (μ0/π)·acosh(d/2a) to 1e-4 (exact two-wire line, transmission-line texts)', (radius, centreDistance) => {
    const result = inductanceGradientOf({ kind: 'round', radius, centreDistance });
    const exact = (MU0 / Math.PI) * Math.acosh(centreDistance / (2 * radius));
    expect(relative(result.inductanceGradientHighFrequency, exact)).toBeLessThan(1e-4);
    // the reported error estimate is honest: the true error is no larger
    expect(relative(result.inductanceGradientHighFrequency, exact)).toBeLessThanOrEqual(result.estimatedRelativeError * 1.5);
  });

  it('uniform-current L′ of round rails is (μ0/π)(¼ + ln(d/a)) and exceeds the high-frequency value (internal inductance, published formula)', () => {
    const result = inductanceGradientOf({ kind: 'round', radius: 4e-3, centreDistance: 20e-3 });
    expect(result.inductanceGradientUniform).toBeCloseTo((MU0 / Math.PI) * (0.25 + Math.log(5)), 15);
    expect(result.inductanceGradientUniform).toBeGreaterThan(result.inductanceGradientHighFrequency);
  });
});

describe('geometric mean distances of rectangles (Grover, Inductance Calculations)', () => {
  it("self GMD of a rectangle equals Grover's exact closed form (from memory, high) and 0.44705·a for a square", () => {
    const grover = (a: number, b: number) =>
      Math.log(Math.hypot(a, b)) -
      ((a * a) / (6 * b * b)) * Math.log(Math.sqrt(1 + (b * b) / (a * a))) -
      ((b * b) / (6 * a * a)) * Math.log(Math.sqrt(1 + (a * a) / (b * b))) +
      ((2 * a) / (3 * b)) * Math.atan(b / a) +
      ((2 * b) / (3 * a)) * Math.atan(a / b) -
      25 / 12;
    for (const [a, b] of [[1, 1], [1, 0.02], [50, 1], [1, 3]] as const) {
      const r = { x: { low: 0, high: a }, y: { low: 0, high: b } };
      expect(logGeometricMeanDistance(r, r)).toBeCloseTo(grover(a, b), 10);
    }
    const square = { x: { low: 0, high: 1 }, y: { low: 0, high: 1 } };
    expect(Math.exp(logGeometricMeanDistance(square, square))).toBeCloseTo(0.44705, 5);
  });

  it('closed-form mutual GMD agrees with Gauss–Legendre quadrature where both are accurate (numerical cross-check)', () => {
    const right = { x: { low: 0.5, high: 1.5 }, y: { low: -0.5, high: 0.5 } };
    const left = { x: { low: -1.5, high: -0.5 }, y: { low: -0.5, high: 0.5 } };
    expect(logGeometricMeanDistance(right, left)).toBeCloseTo(logGeometricMeanDistanceByQuadrature(right, left), 11);
  });

  it('far apart, the GMD of two bars tends to their centre distance (definition of GMD)', () => {
    expect(Math.exp(logDistanceRatioOfBars(1, 1, 50) + Math.log(0.44705))).toBeCloseTo(51, 1);
  });
});

describe('uniform-current L′ of rectangular rails', () => {
  // Grover's approximate formula (from memory, high: F. W. Grover, Inductance Calculations) against the
  // exact GMD value. Checked over s/h ≥ 1 with 0.25 ≤ w/h ≤ 2, where it is within 3 %; outside that (very
  // thin or very wide bars at s ≈ h) it deviates by up to ≈ 8 %, so the recalled "within 3 % for s/h ≥ 1"
  // holds only for bars of moderate aspect.
  const grover = (h: number, w: number, s: number) => (MU0 / Math.PI) * (Math.log((s + w) / (w + h)) + 1.5);
  for (const s of [1, 1.5, 2, 5, 10, 30]) {
    for (const w of [0.25, 0.5, 1, 2]) {
      it(`s/h = ${s}, w/h = ${w}: Grover's formula is within 3 % of the exact GMD value`, () => {
        const exact = (MU0 / Math.PI) * logDistanceRatioOfBars(1, w, s);
        expect(relative(grover(1, w, s), exact)).toBeLessThan(0.03);
      });
    }
  }

  it('the rail API returns the exact GMD value (h = w = s = 20 mm)', () => {
    const result = inductanceGradientOf({ kind: 'rectangular', height: 0.02, width: 0.02, separation: 0.02 });
    expect(result.inductanceGradientUniform).toBeCloseTo((MU0 / Math.PI) * logDistanceRatioOfBars(1, 1, 1), 15);
    expect(relative(result.inductanceGradientUniform, grover(1, 1, 1))).toBeLessThan(0.01);
  });
});

describe('high-frequency L′ of rectangular rails', () => {
  it('h = w = s converges to 0.4513 µH/m (independent field solution; a cross-check, not a published source)', () => {
    const result = inductanceGradientOf({ kind: 'rectangular', height: 0.02, width: 0.02, separation: 0.02 });
    expect(result.inductanceGradientHighFrequency * 1e6).toBeCloseTo(0.4513, 3);
    expect(result.estimatedRelativeError).toBeLessThan(INDUCTANCE_TOLERANCE);
  });

  it('converges under refinement: raw solutions on finer meshes close in on the converged value (self-convergence)', () => {
    const converged = inductanceGradientOf({ kind: 'rectangular', height: 1, width: 0.5, separation: 1.5 });
    const gaps = [8, 16, 32].map((resolution) => Math.abs(loopInductanceFromPanels(rectangularRailPanels(0.5, 1.5, resolution)) / converged.inductanceGradientHighFrequency - 1));
    expect(gaps[1]!).toBeLessThan(gaps[0]!);
    expect(gaps[2]!).toBeLessThan(gaps[1]!);
    expect(gaps[2]!).toBeLessThan(1e-5);
  });

  it('lies below the uniform-current value for every shape (least-energy distribution; Thomson’s theorem analogue)', () => {
    for (const [h, w, s] of [[1, 1, 1], [1, 0.02, 1], [1, 50, 1], [1, 1, 0.02], [1, 1, 50], [50, 1, 1], [1, 0.5, 0.3]] as const) {
      const result = inductanceGradientOf({ kind: 'rectangular', height: h, width: w, separation: s });
      expect(result.inductanceGradientHighFrequency).toBeLessThan(result.inductanceGradientUniform);
    }
  });

  it('tall rails close together approach the parallel-plate value μ0·s/h from below (published: parallel-plate line; fringing adds capacitance)', () => {
    const ratio = (s: number) =>
      inductanceGradientOf({ kind: 'rectangular', height: 1, width: 0.5, separation: s }).inductanceGradientHighFrequency / (MU0 * s);
    expect(ratio(0.02)).toBeLessThan(1);
    expect(ratio(0.02)).toBeGreaterThan(0.9);
    expect(ratio(0.02)).toBeGreaterThan(ratio(0.05));
  });

  it('grows with separation and falls with rail height (monotone in geometry)', () => {
    const at = (h: number, s: number) => inductanceGradientOf({ kind: 'rectangular', height: h, width: 1, separation: s }).inductanceGradientHighFrequency;
    expect(at(1, 1.2)).toBeGreaterThan(at(1, 1));
    expect(at(1.2, 1)).toBeLessThan(at(1, 1));
  });

  it('is scale-free and cached by shape (same figure for a scaled copy)', () => {
    const a = inductanceGradientOf({ kind: 'rectangular', height: 0.01, width: 0.007, separation: 0.013 });
    const b = inductanceGradientOf({ kind: 'rectangular', height: 1, width: 0.7, separation: 1.3 });
    expect(b).toBe(a);
  });
});

describe('bad rail geometry names the path', () => {
  const cases: Array<[string, RailGeometry, string]> = [
    ['negative height', { kind: 'rectangular', height: -1, width: 1, separation: 1 }, 'rails.geometry.height'],
    ['zero separation', { kind: 'rectangular', height: 1, width: 1, separation: 0 }, 'rails.geometry.separation'],
    ['width out of range', { kind: 'rectangular', height: 1, width: 0.01, separation: 1 }, 'rails.geometry.width'],
    ['touching round rails', { kind: 'round', radius: 1, centreDistance: 2 }, 'rails.geometry.centreDistance'],
    ['negative radius', { kind: 'round', radius: -1, centreDistance: 2 }, 'rails.geometry.radius'],
    ['far apart round rails', { kind: 'round', radius: 1, centreDistance: 101 }, 'rails.geometry.centreDistance'],
    ['unknown kind', { kind: 'oval' } as unknown as RailGeometry, 'rails.geometry.kind'],
  ];
  it.each(cases)('%s', (_name, geometry, where) => {
    let caught: unknown;
    try {
      inductanceGradientOf(geometry);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(InputError);
    expect((caught as InputError).where).toBe(where);
  });
});

describe('rail geometry from a scenario object', () => {
  it('infers the kind from the keys', () => {
    expect(railGeometryFromObject({ height: 0.02, width: 0.01, separation: 0.015 })).toEqual({ kind: 'rectangular', height: 0.02, width: 0.01, separation: 0.015 });
    expect(railGeometryFromObject({ radius: 0.005, centreDistance: 0.03 })).toEqual({ kind: 'round', radius: 0.005, centreDistance: 0.03 });
  });
  it('names a misspelt or missing key', () => {
    expect(() => railGeometryFromObject({ height: 0.02, widht: 0.01, separation: 0.015 })).toThrow(/rails\.geometry\.widht: unknown key/);
    expect(() => railGeometryFromObject({ height: 0.02, separation: 0.015 })).toThrow(/rails\.geometry\.width: expected a length/);
  });
});
