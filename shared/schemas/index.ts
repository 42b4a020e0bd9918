export * from './frame.js';
export * from './chemistry.js';
export * from './reading.js';
export * from './run-event.js';
export * from './run-summary.js';
export * from './measure-config.js';
export * from './meter-accuracy.js';
