export * from './time.js';
export * from './convert.js';
export * from './format.js';
export * from './export-number.js';
