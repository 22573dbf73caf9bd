/** Entry of the bundled unit library (dist/unit-library.cjs, see unitLibrary.ts): only mathjs's `unit`. */
export { unit } from 'mathjs';
