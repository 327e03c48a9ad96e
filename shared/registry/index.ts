/** The registry contract: case, therapy, outcome and workflow schemas, completeness, derived measures, dictionary. */
export * from './meta.js';
export * from './text.js';
export * from './case.js';
export * from './therapy.js';
export * from './outcome.js';
export * from './status.js';
export * from './list.js';
export * from './completeness.js';
export * from './record.js';
export * from './worklist.js';
export * from './derived.js';
export * from './dictionary.js';
