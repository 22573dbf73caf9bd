/**
 * The engineering checks of one shot of one scenario: gathers what the checks need from the scenario
 * (geometry, materials, contact model, thresholds) and the results. Used by run, reports and studies alike.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import type { ShotResults } from '../solve/types.js';
import { engineeringChecks, type Check } from './engineering.js';

export function shotChecks(scenario: Scenario, results: ShotResults): Check[] {
  // a ring-down into a short has no rails or armature to judge: only the bank's checks apply
  if (scenario.load) return engineeringChecks({ results, bank: scenario.bank, ...(scenario.limits ? { limits: scenario.limits } : {}) }).filter((c) => c.id !== 'peak-acceleration');
  const solid = scenario.armature.arcDrop === 0;
  return engineeringChecks({
    results,
    bank: scenario.bank,
    rails: {
      ...(scenario.rails.geometry ? { geometry: scenario.rails.geometry } : {}),
      ...(scenario.rails.material ? { material: scenario.rails.material } : {}),
      ...(scenario.rails.derived?.characteristicTime ? { characteristicTime: scenario.rails.derived.characteristicTime } : {}),
    },
    armature: {
      ...(scenario.armature.derived ? { currentArea: scenario.armature.derived.currentArea } : {}),
      ...(scenario.armature.material ? { material: scenario.armature.material } : {}),
    },
    ...(solid ? { contact: { preload: scenario.friction.preload, magneticLoading: scenario.friction.magneticLoading } } : {}),
    ...(scenario.limits ? { limits: scenario.limits } : {}),
  });
}

/**
 * The ids of every check a shot of this scenario can have, in the order the checks come: the columns of a study's
 * verdicts. Which checks apply depends on what the scenario gives (geometry, materials, a solid armature), not on
 * the shot, except where a varied path changes it (a varied arc drop can make the armature solid or not).
 */
export function checkIdsFor(scenario: Scenario, variedPaths: readonly string[] = []): string[] {
  const bankChecks = [...scenario.bank.map((_, index) => `capacitor-reversal[${index}]`), 'capacitor-shock-hazard', 'capacitor-arc-flash-hazard'];
  if (scenario.load) return bankChecks; // a ring-down: only the bank is judged (as in shotChecks)
  const geometry = scenario.rails.geometry;
  const mayBeSolid = scenario.armature.arcDrop === 0 || variedPaths.includes('armature.arcDrop');
  return [
    ...(scenario.armature.derived && scenario.armature.material ? ['armature-action'] : []),
    ...(geometry && scenario.rails.material ? ['rail-heating'] : []),
    ...(geometry?.kind === 'rectangular' ? ['linear-current-density'] : []),
    ...(mayBeSolid ? ['contact-force'] : []),
    ...(geometry ? ['rail-separating-force'] : []),
    'peak-acceleration',
    ...bankChecks,
  ];
}

/** The `railsDerived` block of the JSON output, when the rails were given by geometry. */
export type RailsDerivedJson = NonNullable<ReturnType<typeof railsDerivedJson>>;

export function railsDerivedJson(scenario: Scenario, shot?: Shot) {
  const derived = scenario.rails.derived;
  if (!derived) return undefined;
  const diffusion = scenario.rails.diffusion;
  const railAction = shot?.railAction ?? 0;
  return {
    /** where R′ came from: current diffusion in each rail section, the quarter-period constant, a given number, or none */
    resistanceModel: scenario.rails.resistanceSource ?? (diffusion ? ('diffusion' as const) : ('given' as const)),
    /** the rails' loss over ∫x I² dt: the constant loop R′ that would have lost as much (Ω/m) */
    resistanceGradientLossEquivalent: shot && railAction > 0 ? shot.results.energy.losses.rails / railAction : null,
    /** diffusion: width of the high-frequency current sheet of one rail and the slab's depth (m), the cells integrated */
    ...(diffusion ? { diffusionCurrentWidth: diffusion.face, diffusionDepth: diffusion.depth, diffusionCells: diffusion.modes.length, diffusionHeldInductanceGradient: diffusion.tailInductanceGradient } : {}),
    inductanceGradient: scenario.rails.inductanceGradient,
    inductanceGradientHighFrequency: derived.inductanceGradientHighFrequency,
    inductanceGradientUniform: derived.inductanceGradientUniform,
    /**
     * the loop R′ of the shot (Ω/m): the constant it used, or with current diffusion (no single constant) the
     * loss-equivalent value, null before a shot
     */
    resistanceGradient: diffusion ? (shot && railAction > 0 ? shot.results.energy.losses.rails / railAction : null) : scenario.rails.resistanceGradient,
    estimatedRelativeError: derived.estimatedRelativeError,
    resistanceGradientDC: derived.resistanceGradientDC,
    penetrationDepth: derived.penetrationDepth,
    characteristicTime: derived.characteristicTime,
  };
}
