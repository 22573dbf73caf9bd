import { InputError } from '../scenario/errors.js';

/** Run `work`; a problem it reports without a file (a solver failure) is attributed to the scenario file. */
export function inFile<T>(file: string, work: () => T): T {
  try {
    return work();
  } catch (error) {
    if (error instanceof InputError && !error.file) throw new InputError(error.where, error.problem, file);
    throw error;
  }
}
