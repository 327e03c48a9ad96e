/** Clinical rules: scores, PPC definitions, body measures, stay and therapy checks. */
export * from './ariscat.js';
export * from './pneumonia-nhsn.js';
export * from './ppc-epco.js';
export * from './melbourne-group-scale.js';
export * from './body.js';
export * from './stay.js';
export * from './ppc-composite.js';
export * from './therapy-checks.js';
export { dateObservations, ofKind, type DatedObservation } from './observation-dates.js';
