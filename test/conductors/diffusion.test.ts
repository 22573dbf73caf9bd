/**
 * Rail current diffusion during the shot (src/conductors/diffusion.ts and its cells in the shot model), against
 * closed forms of magnetic diffusion into a conductor [published: e.g. H. Knoepfel, Pulsed High Magnetic Fields,
 * chapter on magnetic diffusion; or any text on magnetic diffusion: a field step on a half-space gives
 * H = K·erfc(x/2√(Dt)), D = ρ/μ0, with Joule loss ρK²/√(2πDt) per unit area; in sinusoidal steady state a thick
 * conductor has the surface resistance ρ/δ, δ = √(2ρ/(ωμ0))].
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { getMaterial } from '../../src/conductors/materials.js';
import { MAX_DIFFUSION_MODES, railDiffusion, railDiffusionOf } from '../../src/conductors/diffusion.js';
import { highFrequencyCurrentWidth } from '../../src/conductors/inductance.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { LOCKED, moduleGroup, scenario } from '../helpers/scenario.js';

const MU0 = 4e-7 * Math.PI;
const copper = getMaterial('copper');
const rho = copper.resistivity;
const D = rho / MU0;

/** erfc by its continued fraction / series (W. J. Cody-type accuracy is not needed: 1e-10 here). */
function erfc(x: number): number {
  // erfc(x) = 1 − erf(x); erf by its Taylor series for small x, by the asymptotic continued fraction for large x
  if (x < 3) {
    let term = x;
    let sum = x;
    for (let n = 1; n < 200; n++) {
      term *= (-x * x) / n;
      sum += term / (2 * n + 1);
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * sum;
  }
  let f = 0;
  for (let n = 60; n >= 1; n--) f = (n / 2) / (x + f);
  return Math.exp(-x * x) / Math.sqrt(Math.PI) / (x + f);
}

describe('current step into a thick conductor (half-space closed form)', () => {
  // one rail 10 mm high, 20 mm thick; at t = 175 µs the current has diffused √(Dt) = 1.5 mm, far from the back face
  // (erfc(w/2√(Dt)) ~ 1e-20)
  const h = 0.01;
  const w = 0.02;
  const t = 175e-6;
  // every cell integrated: λ_24·t ≫ 1, so the cells left out have long since carried the whole current
  const ladder = railDiffusion(h, w, rho, Infinity);

  it('keeps the number of cells it integrates bounded', () => {
    expect(ladder.modes.length).toBe(MAX_DIFFUSION_MODES);
    expect(ladder.modes[MAX_DIFFUSION_MODES - 1]!.rate * t).toBeGreaterThan(20);
  });

  it('instantaneous Joule loss of a rail section born with empty cells equals ρK²h/√(2πDt) (to 0.5 %)', () => {
    const I = 1000;
    // a cell carries i_L = I(1 − e^(−λt)) after a step; its resistor I·e^(−λt). Per rail: half the loop figures.
    let loss = (ladder.resistanceGradientDC / 2) * I * I;
    for (const m of ladder.modes) loss += (m.resistanceGradient / 2) * (I * Math.exp(-m.rate * t)) ** 2;
    const K = I / h;
    const halfSpace = (rho * K * K * h) / Math.sqrt(2 * Math.PI * D * t);
    expect(Math.abs(loss / halfSpace - 1)).toBeLessThan(5e-3);
  });

  it('the field inside follows erfc(x/2√(Dt)) (modal reconstruction from the cells, to 1 % of K)', () => {
    // the slab's field is K[(1 − x/w) − Σ 2/(nπ)·sin(nπx/w)·e^(−λ_n t)]: cell n's resistor current is the amplitude
    for (const depth of [0, 0.1e-3, 0.25e-3, 0.5e-3, 1e-3]) {
      let field = 1 - depth / w;
      ladder.modes.forEach((m, k) => {
        const n = k + 1;
        field -= (2 / (n * Math.PI)) * Math.sin((n * Math.PI * depth) / w) * Math.exp(-m.rate * t);
      });
      expect(Math.abs(field - erfc(depth / (2 * Math.sqrt(D * t))))).toBeLessThan(0.01);
    }
  });
});

describe('sinusoidal steady state', () => {
  /** Re Z(jω) of the ladder per rail: DC + Σ R_n ω²/(ω² + λ_n²); the fast cells held as inductance add nothing. */
  const ladderResistance = (l: ReturnType<typeof railDiffusion>, omega: number) =>
    l.resistanceGradientDC / 2 + l.modes.reduce((sum, m) => sum + (m.resistanceGradient / 2) * (omega * omega) / (omega * omega + m.rate * m.rate), 0);

  it('a thick rail at 2 kHz has the skin-depth resistance ρ/(h·δ) (to 3 %)', () => {
    const h = 0.015;
    const w = 0.03;
    const omega = 2 * Math.PI * 2000;
    const delta = Math.sqrt((2 * rho) / (omega * MU0));
    expect(w / delta).toBeGreaterThan(8);
    const ladder = railDiffusion(h, w, rho, Infinity);
    expect(Math.abs(ladderResistance(ladder, omega) / (rho / (h * delta)) - 1)).toBeLessThan(0.03);
  });

  it('with the shot\'s truncation (cells up to λ ≤ 4/τ), the resistance at the quarter-period frequency is within 8 % of the exact slab (below it: the held cells add no steady-state loss) Re[ρ/(hw)·kw·coth kw]', () => {
    const h = 0.015;
    const w = 0.01;
    const tau = 100e-6;
    const omega = Math.PI / (2 * tau);
    const ladder = railDiffusion(h, w, rho, 4 / tau);
    // exact: kw coth kw with k = (1 + j)/δ
    const delta = Math.sqrt((2 * rho) / (omega * MU0));
    const a = w / delta;
    // (1+j)a·coth((1+j)a); coth(z) = (sinh 2a' ...) → use Re[(1+j)a (sinh 2a − j sin 2a)/(cosh 2a − cos 2a)]
    const re = (a * (Math.sinh(2 * a) + Math.sin(2 * a))) / (Math.cosh(2 * a) - Math.cos(2 * a));
    const exact = (rho / (h * w)) * re;
    const ratio = ladderResistance(ladder, omega) / exact;
    expect(ratio).toBeLessThan(1);
    expect(ratio).toBeGreaterThan(0.92);
  });
});

describe('thin rails reach the uniform-current limit', () => {
  it('a rail much thinner than the skin depth at the shot\'s rate has no cell: R′ = 2ρ/(h w)', () => {
    const ladder = railDiffusion(0.01, 0.5e-3, rho, 4 / 100e-6);
    expect(ladder.modes.length).toBe(0);
    expect(ladder.resistanceGradientDC).toBeCloseTo((2 * rho) / (0.01 * 0.5e-3), 15);
    // the held inductance is the whole internal inductance of a uniform current, μ0 w/(3h) per rail [derived]
    expect(ladder.tailInductanceGradient).toBeCloseTo((2 * MU0 * 0.5e-3) / (3 * 0.01), 15);
  });

  it('in a shot, thin copper rails lose R′_DC·∫x I² dt plus at most 1 % (the birth loss of the held cells)', () => {
    const raw = JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8'));
    raw.rails.geometry = { height: '15 mm', width: '0.3 mm', separation: '15 mm' };
    raw.rails.material = 'copper';
    const s = scenarioFromRaw(raw, 'thin.json');
    expect(s.rails.diffusion!.modes.length).toBe(0);
    const shot = runShot(s, { waveforms: false });
    const uniform = s.rails.diffusion!.resistanceGradientDC * shot.railAction!;
    const rails = shot.results.energy.losses.rails;
    expect(rails).toBeGreaterThanOrEqual(uniform);
    expect(rails / uniform - 1).toBeLessThan(0.01);
  });
});

describe('the shot integrates the cells exactly as their circuit', () => {
  it('locked armature: the rail loss equals Σ R′_n x ∫(I − i_L,n)² dt + R′_DC x ∫I² dt with i_L,n solved independently from the recorded current (1e-5)', () => {
    const x = 0.3;
    const ladder = railDiffusionOf(0.015 * 0.01, 0.015, rho, 4 / 150e-6);
    expect(ladder.modes.length).toBeGreaterThan(0);
    const s = scenario({ bank: [moduleGroup({ crowbar: { drop: 20, resistance: 2e-3 } })], armature: { position: x }, friction: LOCKED, rails: { length: 1, resistanceGradient: ladder.resistanceGradientDC, diffusion: ladder }, solver: { sampleInterval: 0.05e-6, endTime: 3e-3 } });
    const shot = runShot(s);
    const wf = shot.waveforms!;
    // trapezoid in time for di_L/dt = λ(I − i_L) (exact for piecewise-linear I) and Simpson-like loss sum
    let loss = 0;
    const cells = ladder.modes.map(() => 0);
    for (let k = 1; k < wf.t.length; k++) {
      const dt = wf.t[k]! - wf.t[k - 1]!;
      if (dt <= 0) continue;
      const i0 = wf.current[k - 1]!;
      const i1 = wf.current[k]!;
      loss += (ladder.resistanceGradientDC * x * dt * (i0 * i0 + i1 * i1)) / 2;
      ladder.modes.forEach((m, n) => {
        const before = cells[n]!;
        const decay = Math.exp(-m.rate * dt);
        // exact for I linear over the interval
        const slope = (i1 - i0) / dt;
        const after = i1 - slope / m.rate + (before - i0 + slope / m.rate) * decay;
        cells[n] = after;
        loss += (m.resistanceGradient * x * dt * ((i0 - before) ** 2 + (i1 - after) ** 2)) / 2;
      });
    }
    const rails = shot.results.energy.losses.rails;
    expect(Math.abs(loss / rails - 1)).toBeLessThan(1e-5);
    expect(rails).toBeGreaterThan(1.05 * ladder.resistanceGradientDC * x * shot.results.actionIntegral);
  });
});

describe('the geometry demo', () => {
  it('its high-frequency current spreads over about 2.3 × the inner face (boundary elements), so the slab is 2.3 × wider and thinner', () => {
    const width = highFrequencyCurrentWidth({ kind: 'rectangular', height: 0.015, width: 0.01, separation: 0.015 });
    expect(width / 0.015).toBeGreaterThan(2.2);
    expect(width / 0.015).toBeLessThan(2.4);
  });
});

describe('bad input', () => {
  const base = () => JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8'));
  const problem = (raw: Record<string, unknown>) => {
    try {
      scenarioFromRaw(raw, 'x.json');
    } catch (error) {
      return error as { where: string; problem: string };
    }
    return null;
  };
  it('refuses an unknown resistance model, naming rails.resistanceModel', () => {
    const raw = base();
    raw.rails.resistanceModel = 'skin';
    expect(problem(raw)?.where).toBe('rails.resistanceModel');
  });
  it('refuses a resistance model beside a numeric R′ (held constant) or without a material', () => {
    const raw = base();
    raw.rails.resistanceModel = 'diffusion';
    raw.rails.resistanceGradient = '0.3 mohm/m';
    expect(problem(raw)?.problem).toMatch(/held constant|constant/);
    const bare = base();
    bare.rails.resistanceModel = 'diffusion';
    delete bare.rails.material;
    expect(problem(bare)?.where).toBe('rails.resistanceModel');
  });
  it('refuses diffusion for round rails', () => {
    const raw = base();
    raw.rails.geometry = { radius: '6 mm', centreDistance: '30 mm' };
    raw.rails.resistanceModel = 'diffusion';
    expect(problem(raw)?.problem).toMatch(/rectangular/);
  });
  it('a numeric R′ stays constant: no diffusion cells', () => {
    const raw = base();
    raw.rails.resistanceGradient = '0.5 mohm/m';
    const s = scenarioFromRaw(raw, 'x.json');
    expect(s.rails.diffusion).toBeUndefined();
    expect(s.rails.resistanceGradient).toBeCloseTo(0.5e-3, 15);
  });
});
