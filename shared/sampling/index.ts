/**
 * Sampling for incoming inspection: single sampling plans by attributes (ISO 2859-1 code letters,
 * normal and tightened tables, ANSI/ASQ Z1.4 reduced table, arrows resolved, 100 % when n ≥ N), the
 * switching rules between severities per supplier and part, the operating characteristic of a
 * plan, and a reproducible random sample drawn from a stored seed. Pure: no I/O, no database.
 */
export * from './tables';
export * from './plan';
export * from './switching';
export * from './sequence';
export * from './oc';
export * from './sample';
