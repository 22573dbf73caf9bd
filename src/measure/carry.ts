/**
 * Carrying a calibration into another scenario of the same bank: a ring-down into a shorted load gives the
 * bank's pulse inductances and resistances (module and feed), which a launch scenario then uses. Every
 * fitted value is carried to the same path of the other scenario, except the short's own values (`load.*`),
 * which a launch does not have. With `allGroups`, a value fitted for one group (`bank[0].inductance`) is
 * carried to that quantity of every group of the other scenario: right when all groups are built of the same
 * module, as a bank usually is (the values are per module, so the group sizes may differ). Pure.
 */
import { InputError } from '../core/errors.js';
import { getScenarioPath, parsePath } from '../scenario/paths.js';
import type { Scenario } from '../scenario/types.js';

export interface FittedValue {
  value: number;
  uncertainty: number;
}

/** The values to write into `target` (path → value), or an InputError naming what does not fit. */
export function carriedValues(fitted: Record<string, FittedValue>, target: Scenario, targetFile: string, allGroups: boolean): Record<string, FittedValue> {
  const out: Record<string, FittedValue> = {};
  for (const [path, value] of Object.entries(fitted)) {
    if (path.startsWith('load.')) continue;
    const steps = parsePath(path);
    const group = steps && steps[0] === 'bank' && typeof steps[1] === 'number' ? steps[1] : null;
    const targets = allGroups && group !== null ? target.bank.map((_, n) => `bank[${n}]${path.slice(path.indexOf(']') + 1)}`) : [path];
    for (const into of targets) {
      try {
        getScenarioPath(target, into);
      } catch {
        throw new InputError('--carry-into', `${targetFile} has no ${into} to carry the fitted ${path} into (its bank has ${target.bank.length} group(s))`);
      }
      if (into in out && out[into]!.value !== value.value) {
        throw new InputError('--carry-into', `two fitted values would go to ${into} of ${targetFile} (give one group's values, or leave out --carry-to-all-groups)`);
      }
      out[into] = value;
    }
  }
  if (Object.keys(out).length === 0) throw new InputError('--carry-into', `nothing to carry into ${targetFile}: only the short's own values (load.*) were fitted`);
  return out;
}
