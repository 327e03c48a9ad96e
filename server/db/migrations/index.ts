// Every migration, in order, as imported classes (a glob cannot load .ts under vitest).
import { Foundation1796163103776 } from './1796163103776-Foundation.js';
import { Registry1796163954334 } from './1796163954334-Registry.js';
import { Imports1796164096770 } from './1796164096770-Imports.js';
import { Committee1796164117741 } from './1796164117741-Committee.js';
import { Exports1796164118550 } from './1796164118550-Exports.js';
import { AnalysisCohorts1796164184488 } from './1796164184488-AnalysisCohorts.js';
import { Quality1796164293745 } from './1796164293745-Quality.js';
import { BulkRefreshAndListIndex1796200000000 } from './1796200000000-BulkRefreshAndListIndex.js';
import { LateralFactSource1796300000000 } from './1796300000000-LateralFactSource.js';
import { WorklistIndexes1796300000001 } from './1796300000001-WorklistIndexes.js';

export const migrations = [Foundation1796163103776, Registry1796163954334, Imports1796164096770, Committee1796164117741, Exports1796164118550, AnalysisCohorts1796164184488, Quality1796164293745, BulkRefreshAndListIndex1796200000000, LateralFactSource1796300000000, WorklistIndexes1796300000001];
