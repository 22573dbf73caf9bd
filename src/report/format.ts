/**
 * The report room's name for the one number formatter, which lives in src/units/format.ts (terminal, pages, studies
 * and the index all write numbers the same way). Nothing is formatted here.
 */
export * from '../units/format.js';
