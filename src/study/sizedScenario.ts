/**
 * The sized scenario as a scenario file: the user's file as written, with each group's count, charge voltage
 * and trigger replaced by the sized values (SI numbers), so geometry, materials and limits carry over.
 */
import { setRawPath } from '../scenario/paths.js';
import type { SizingResult } from './size.js';

export function sizedScenarioJson(raw: Record<string, unknown>, from: { file: string; name: string; sha256: string }, result: SizingResult): string {
  const copy = structuredClone(raw);
  const sized = result.scenario!;
  sized.bank.forEach((group, g) => {
    setRawPath(copy, `bank[${g}].count`, group.count);
    setRawPath(copy, `bank[${g}].voltage`, group.voltage);
    setRawPath(copy, `bank[${g}].trigger`, group.trigger);
  });
  copy.name = `${from.name} (sized)`;
  copy.description = `Sized by railpulse size from ${from.file} (sha256 ${from.sha256.slice(0, 16)}…) for ${result.targetVelocity.toPrecision(6)} m/s at exit: ${result.best?.modulesPerGroup} module(s) per group, least stored energy within the limits; counts, voltages (V) and triggers (s) in SI.`;
  return `${JSON.stringify(copy, null, 2)}\n`;
}
