// The design page's stand-in for node:module. src/solve/odex.ts loads odex with createRequire (odex ships no
// declarations); in the browser bundle that one require returns the bundled odex, and nothing else can be required.
import odex from 'odex';

export function createRequire() {
  return (name) => {
    if (name === 'odex') return odex;
    throw new Error(`the design page cannot load ${name}`);
  };
}
