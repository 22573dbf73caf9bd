/**
 * Opt-in timing of where a shot's time goes, for the benchmark. Off (no profile passed to runShot), every hook
 * is one shared no-op function, so a plain shot pays nothing measurable; on, each phase boundary reads the clock.
 *
 * Phases: `setup` (plant, scaling), `integration` (odex's own work: its steps, extrapolation tables and dense-output
 * coefficients), `rhs` (the model's right-hand side, called by odex), `events`
 * (sampling event functions on the dense output, bracketing, root finding), `peaks` (running maxima and their
 * location on the dense output), `quadrature` (Gauss–Legendre sums of losses, action and impulse), `recording`
 * (waveform samples and event-instant records), `restart` (between odex runs: applying events, new solver),
 * `finish` (ledger and results).
 */

export const PROFILE_PHASES = ['setup', 'integration', 'rhs', 'events', 'peaks', 'quadrature', 'recording', 'restart', 'finish'] as const;
export type ProfilePhase = (typeof PROFILE_PHASES)[number];

export interface ShotProfile {
  /** milliseconds per phase, summed over the profiled shots */
  ms: Record<ProfilePhase, number>;
  /** shots profiled */
  shots: number;
  /** dense-output component evaluations, summed */
  denseEvaluations: number;
}

export function createProfile(): ShotProfile {
  return { ms: Object.fromEntries(PROFILE_PHASES.map((p) => [p, 0])) as Record<ProfilePhase, number>, shots: 0, denseEvaluations: 0 };
}

/** Switch to `phase`, charging the time since the last switch to the phase that was running; returns that phase. */
export type PhaseSwitch = (phase: ProfilePhase) => ProfilePhase;

const noSwitch: PhaseSwitch = () => 'setup';

/** A phase switch for one shot: the no-op without a profile. */
export function phaseSwitch(profile: ShotProfile | undefined): PhaseSwitch {
  if (!profile) return noSwitch;
  profile.shots++;
  let current: ProfilePhase = 'setup';
  let since = performance.now();
  return (phase) => {
    const now = performance.now();
    profile.ms[current] += now - since;
    since = now;
    const was = current;
    current = phase;
    return was;
  };
}
