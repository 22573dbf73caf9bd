// The design page's stand-in for node:module. Two of our modules load a package with createRequire:
// src/solve/odex.ts loads odex (it ships no declarations) and src/units/unitLibrary.ts loads mathjs's unit reader
// on first use (a Node process skips its set-up when every value is simple). In the browser bundle those two
// requires return the bundled packages; nothing else can be required.
import odex from 'odex';
import { unit } from 'mathjs';

export function createRequire() {
  return (name) => {
    if (name === 'odex') return odex;
    if (name === 'mathjs') return { unit };
    throw new Error(`the design page cannot load ${name}`);
  };
}
