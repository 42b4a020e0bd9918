/** Verdicts and derived figures in one import. */
export * from './figures.js';
export * from './nominal.js';
export * from './peukert.js';
export * from './internal-resistance.js';
export * from './incremental-capacity.js';
export * from './lead-acid-correction.js';
export * from './summarize-run.js';
export * from './uncertainty.js';
