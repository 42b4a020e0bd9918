export * from './convert.js';
export * from './format.js';
