// The data-quality area's entities (theatre lists, re-abstraction, consistency findings).
import { TheatreListEntry, TheatreListUpload } from './quality-theatre-list.js';
import { ReabstractionAdjudication, ReabstractionItem, ReabstractionSample } from './quality-reabstraction.js';
import { QualityFinding } from './quality-finding.js';

export { TheatreListEntry, TheatreListUpload, ReabstractionAdjudication, ReabstractionItem, ReabstractionSample, QualityFinding };
export const qualityEntities = [TheatreListUpload, TheatreListEntry, ReabstractionSample, ReabstractionItem, ReabstractionAdjudication, QualityFinding];
