/**
 * Inductance gradient L′ (loop inductance per metre of the rail pair) from rail geometry.
 *
 * - High-frequency limit (surface current, perfect conductor): the electrostatic analogue solved by the
 *   boundary-element method of ./bem.ts, L′ = μ0 ε0 / C′, refined by 1.5× per level and Richardson-
 *   extrapolated (./richardson.ts) until successive extrapolations agree to INDUCTANCE_TOLERANCE.
 * - Uniform current (DC): L′ = (μ0/π)·ln(GMD_between / GMR_self), exact geometric mean distances
 *   (./gmd.ts) for rectangles; (μ0/π)(¼ + ln(d/a)) for round rails.
 *
 * A pulsed gun's L′ lies between the two, nearer the high-frequency value (current diffuses only a short
 * way into the rails during a pulse); the high-frequency value is always the lower one, because the
 * perfect-conductor current distribution is the one of least magnetic energy for the given current.
 *
 * Validity (checked; outside it an InputError names the path, because an unconverged or untested figure
 * must not pass silently into a shot):
 *   rectangular: every ratio of height, width and separation within 1/50 … 50;
 *   round: gap (d − 2a) at least 0.02·a and d at most 100·a.
 * L′ is scale-free, so results are cached by shape ratios: a sweep over size or a repeated lookup is free.
 */
import { InputError } from '../core/errors.js';
import { gradedSegment, loopInductanceFromPanels, equivalentCurrentWidth, type Panel } from './bem.js';
import { logDistanceRatioOfBars } from './gmd.js';
import { refineToConvergence } from './richardson.js';

const MU0 = 4e-7 * Math.PI;

/** Rectangular rails: h = height (along the face that carries the current, facing the other rail),
 * w = width (rail thickness away from the bore), s = gap between the rails' inner faces. Metres. */
export interface RectangularRails {
  kind: 'rectangular';
  height: number;
  width: number;
  separation: number;
}

/** Round rails: conductor radius a and centre-to-centre distance d. Metres. */
export interface RoundRails {
  kind: 'round';
  radius: number;
  centreDistance: number;
}

export type RailGeometry = RectangularRails | RoundRails;

export interface InductanceGradient {
  /** perfect-conductor (surface current) value, H/m */
  inductanceGradientHighFrequency: number;
  /** uniform current density value, H/m */
  inductanceGradientUniform: number;
  /** estimated relative error of the high-frequency value (from the last refinements) */
  estimatedRelativeError: number;
  /** boundary elements used in the quarter model at the final refinement */
  panels: number;
}

/** Relative change between refinements at which the field solution is accepted. */
export const INDUCTANCE_TOLERANCE = 1e-5;
/** The largest ratio of rail dimensions the field solution is validated for. */
export const MAX_ASPECT = 50;

const RATIO = 1.5; // mesh refinement factor between levels
const MAX_PANELS = 2400;

const cache = new Map<string, InductanceGradient>();

/** L′ from geometry; `path` names the scenario key for error messages (e.g. "rails.geometry"). */
export function inductanceGradientOf(geometry: RailGeometry, path = 'rails.geometry'): InductanceGradient {
  validateRailGeometry(geometry, path);
  const key = cacheKey(geometry);
  const cached = cache.get(key);
  if (cached) return cached;
  const result = geometry.kind === 'rectangular' ? rectangular(geometry) : round(geometry);
  cache.set(key, result);
  return result;
}

/** Clears the cache (benchmarks measure a fresh solve with it). */
export function clearInductanceCache(): void {
  cache.clear();
}

function cacheKey(g: RailGeometry): string {
  return g.kind === 'rectangular'
    ? `rect:${(g.width / g.height).toPrecision(12)}:${(g.separation / g.height).toPrecision(12)}`
    : `round:${(g.centreDistance / g.radius).toPrecision(12)}`;
}

/**
 * Rail geometry from a scenario object whose lengths are already SI numbers: `kind` may be omitted and is
 * then inferred from the keys ({height, width, separation} or {radius, centreDistance}).
 */
export function railGeometryFromObject(raw: unknown, path = 'rails.geometry'): RailGeometry {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw))
    throw new InputError(path, 'expected { height, width, separation } (rectangular rails) or { radius, centreDistance } (round rails)');
  const record = raw as Record<string, unknown>;
  const kind = record.kind ?? ('radius' in record || 'centreDistance' in record ? 'round' : 'rectangular');
  const allowed = kind === 'round' ? ['kind', 'radius', 'centreDistance'] : ['kind', 'height', 'width', 'separation'];
  for (const key of Object.keys(record))
    if (!allowed.includes(key)) throw new InputError(`${path}.${key}`, `unknown key for ${String(kind)} rails; expected ${allowed.slice(1).join(', ')}`);
  const geometry = (kind === 'round'
    ? { kind, radius: record.radius, centreDistance: record.centreDistance }
    : { kind, height: record.height, width: record.width, separation: record.separation }) as RailGeometry;
  validateRailGeometry(geometry, path);
  return geometry;
}

export function validateRailGeometry(geometry: RailGeometry, path: string): void {
  const positive = (value: unknown, key: string): number => {
    if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0)
      throw new InputError(`${path}.${key}`, `expected a length greater than 0, got ${String(value)}`);
    return value;
  };
  if (geometry.kind === 'rectangular') {
    const sizes = {
      height: positive(geometry.height, 'height'),
      width: positive(geometry.width, 'width'),
      separation: positive(geometry.separation, 'separation'),
    };
    const largest = Math.max(sizes.height, sizes.width, sizes.separation);
    for (const [key, value] of Object.entries(sizes)) {
      if (largest / value > MAX_ASPECT * (1 + 1e-9))
        throw new InputError(
          `${path}.${key}`,
          `${key} is more than ${MAX_ASPECT} times smaller than the largest rail dimension; the field solution is validated only for ratios of height, width and separation within 1/${MAX_ASPECT}…${MAX_ASPECT} (give rails.inductanceGradient directly instead)`,
        );
    }
    return;
  }
  if (geometry.kind === 'round') {
    const radius = positive(geometry.radius, 'radius');
    const distance = positive(geometry.centreDistance, 'centreDistance');
    if (distance / radius < 2.02 * (1 - 1e-9))
      throw new InputError(`${path}.centreDistance`, `expected a centre distance of at least 2.02 × radius (rails must not touch), got ${distance} m for radius ${radius} m`);
    if (distance / radius > 100 * (1 + 1e-9))
      throw new InputError(`${path}.centreDistance`, `the field solution is validated for centre distances up to 100 × radius, got ${distance / radius} × radius`);
    return;
  }
  throw new InputError(`${path}.kind`, `expected "rectangular" or "round", got ${JSON.stringify((geometry as { kind?: unknown }).kind)}`);
}

function converge(solveAtLevel: (resolution: number) => { value: number; panels: number }): {
  value: number;
  error: number;
  panels: number;
} {
  const result = refineToConvergence(
    (resolution) => {
      const level = solveAtLevel(resolution);
      return { value: level.value, elements: level.panels };
    },
    { start: 4, ratio: RATIO, tolerance: INDUCTANCE_TOLERANCE, maxElements: MAX_PANELS },
  );
  return { value: result.value, error: result.error, panels: result.elements };
}

/**
 * Quarter-model panels of rectangular rails normalised to height 1 (w = width/height, s = separation/height).
 * Each face is split at its corners and graded toward them (exponent 2.5); the panel count of a segment of
 * length ℓ grows as resolution·(ℓ/smallest dimension)^(1/2.5), so that panels near a corner resolve the
 * smallest feature while long faces do not get needlessly many.
 */
export function rectangularRailPanels(w: number, s: number, resolution: number): Panel[] {
  const smallest = Math.min(1, w, s);
  const grading = 2.5;
  const count = (length: number) => Math.max(2, Math.ceil(resolution * Math.pow(length / smallest, 1 / grading)));
  const inner = s / 2;
  const outer = s / 2 + w;
  const top = 0.5;
  return [
    // inner face, from the corner down to the mid-plane
    ...gradedSegment(inner, top, inner, 0, count(0.5), grading),
    // top face in two halves, each graded toward its corner
    ...gradedSegment(inner, top, inner + w / 2, top, count(w / 2), grading),
    ...gradedSegment(outer, top, outer - w / 2, top, count(w / 2), grading),
    // outer face
    ...gradedSegment(outer, top, outer, 0, count(0.5), grading),
  ];
}

/**
 * Quarter-model panels (chords) of round rails of radius 1 with centre distance d. For close rails the
 * charge crowds onto the facing sides (angle π about the rail's centre) over an angular width of about
 * √gap; panels are clustered there by the smooth map tan((π − θ)/2) = k·tan((π − φ)/2) of uniformly
 * spaced φ, with k = √(gap/d) (k → 1: uniform). The map only places panels; the solution is the plain BEM.
 */
export function roundRailPanels(d: number, resolution: number): Panel[] {
  const clustering = Math.min(1, Math.sqrt((d - 2) / d));
  const angle = (fraction: number) => Math.PI - 2 * Math.atan(clustering * Math.tan((Math.PI * (1 - fraction)) / 2));
  const count = Math.ceil(resolution * 4);
  const panels: Panel[] = [];
  for (let k = 0; k < count; k++) {
    const a0 = angle(k / count);
    const a1 = angle((k + 1) / count);
    panels.push({ x0: d / 2 + Math.cos(a0), y0: Math.sin(a0), x1: d / 2 + Math.cos(a1), y1: Math.sin(a1) });
  }
  return panels;
}

function solvePanels(panels: Panel[]): { value: number; panels: number } {
  return { value: loopInductanceFromPanels(panels), panels: panels.length };
}

function rectangular(g: RectangularRails): InductanceGradient {
  // Normalised to h = 1 (L′ is scale-free) so that the panel integrals work on numbers near 1.
  const w = g.width / g.height;
  const s = g.separation / g.height;
  const result = converge((resolution) => solvePanels(rectangularRailPanels(w, s, resolution)));
  return {
    inductanceGradientHighFrequency: result.value,
    inductanceGradientUniform: (MU0 / Math.PI) * logDistanceRatioOfBars(1, w, s),
    estimatedRelativeError: result.error,
    panels: result.panels,
  };
}

function round(g: RoundRails): InductanceGradient {
  const d = g.centreDistance / g.radius; // radius 1
  const result = converge((resolution) => solvePanels(roundRailPanels(d, resolution)));
  return {
    inductanceGradientHighFrequency: result.value,
    inductanceGradientUniform: (MU0 / Math.PI) * (0.25 + Math.log(d)),
    estimatedRelativeError: result.error,
    panels: result.panels,
  };
}

/**
 * Width of one rectangular rail's surface that carries the high-frequency current, as a uniform sheet with the same
 * loss: (∮K dl)²/∮K² dl of the perfect-conductor distribution (see equivalentCurrentWidth), in metres. The corner
 * singularity makes the panel values converge slowly (about as N^−0.8), so the value is Aitken-extrapolated from
 * three meshes (resolution 16, 32, 64; the extrapolated value is within about 0.1 % of the trend on the demos).
 */
export function highFrequencyCurrentWidth(g: RectangularRails): number {
  const w = g.width / g.height;
  const s = g.separation / g.height;
  const [a, b, c] = [16, 32, 64].map((r) => equivalentCurrentWidth(rectangularRailPanels(w, s, r))) as [number, number, number];
  const d1 = b - a;
  const d2 = c - b;
  const extrapolated = d2 !== d1 && Math.abs(d2) < Math.abs(d1) ? c - (d2 * d2) / (d2 - d1) : c;
  return extrapolated * g.height;
}
