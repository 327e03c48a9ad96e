export * from './common.js';
export * from './completeness.js';
export * from './capture.js';
export * from './reabstraction.js';
export * from './findings.js';
