import type { AppContext } from '../context.js';

export interface JobRecord { id: string; kind: string; payload: Record<string, unknown>; createdBy: string | null; attempts: number }
export interface JobTools {
  /** Records progress counters (e.g. { parsed, validated, written, total }); cheap to call often. */
  progress(p: Record<string, number | string>): Promise<void>;
  /** True once someone asked to cancel: the handler should stop and throw JobCancelled. */
  isCancelled(): Promise<boolean>;
}
export type JobHandler = (job: JobRecord, tools: JobTools, context: AppContext) => Promise<Record<string, unknown>>;

export class JobCancelled extends Error {
  constructor() { super('cancelled by the user'); }
}

const handlers = new Map<string, JobHandler>();

/** Each area registers its background work by kind (imports, exports, packets). */
export function registerJobKind(kind: string, handler: JobHandler): void {
  handlers.set(kind, handler);
}

export function jobHandler(kind: string): JobHandler | undefined {
  return handlers.get(kind);
}

export interface Schedule { name: string; everyMs: number; run: (context: AppContext) => Promise<void> }
const schedules: Schedule[] = [];

/** Periodic housekeeping (retention of uploads, exports, sessions; reminders). */
export function registerSchedule(s: Schedule): void {
  if (!schedules.some((x) => x.name === s.name)) schedules.push(s);
}
export function allSchedules(): readonly Schedule[] {
  return schedules;
}
