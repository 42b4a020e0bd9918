/** The measurement core's public API: import from here (`shared/measure/index.js`). */
export * from './run-pipeline.js';
export * from './integrator.js';
export * from './compensated-sum.js';
export * from './trapezoid.js';
export * from './time-to-end.js';
export * from './capacity-to-end-voltage.js';
export * from './detector.js';
export * from './run-stats.js';
export * from './verdict.js';
export * from './cumulative-discharge.js';
