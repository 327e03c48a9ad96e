// Every migration, in order, as imported classes (a glob cannot load .ts under vitest).
import { Foundation1796163103776 } from './1796163103776-Foundation.js';
import { Registry1796163954334 } from './1796163954334-Registry.js';

export const migrations = [Foundation1796163103776, Registry1796163954334];
