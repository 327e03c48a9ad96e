/** Clinical code lists, units, therapy tables, observation schemas and check shapes. */
export * from './codes.js';
export * from './units.js';
export * from './dates.js';
export * from './checks.js';
export * from './modalities.js';
export * from './observations.js';
export * from './scores.js';
export * from './definition-results.js';
