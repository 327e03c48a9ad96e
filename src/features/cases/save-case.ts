/**
 * Saving the form: the case fields first (create, or a PATCH of the changed fields with the
 * version read), then removals, episodes and events one by one, each with the case version the
 * previous write answered (every write raises it). Stops at the first refusal and says where.
 */
import type { Case } from '../../../shared/registry/record.js';
import { ApiError } from '../../lib/api-client.js';
import { createCase, updateCase } from './api/write-case.js';
import { createEpisode, createEvent, removeEpisode, removeEvent, updateEpisode, updateEvent } from './api/write-records.js';
import { changedCaseFields, changedRecordFields, createBody, outcomeFieldNames, pick, therapyFieldNames, type CaseFormOutput, type CaseFormValues } from './form-model.js';
import type { Removal } from './components/therapy-section.js';

export interface SaveBase { case: Case; form: CaseFormValues }

/** A refusal part-way: `saved` is the case as far as it got (null when nothing was written). */
export class SaveError extends Error {
  constructor(override readonly cause: unknown, readonly saved: Case | null, readonly where: string, readonly pathPrefix: string, readonly assigned: Assigned) {
    super(cause instanceof Error ? cause.message : String(cause));
  }
}
/** Record ids given by the server to records created during this save, by form index. */
export interface Assigned { therapy: Record<number, string>; outcomes: Record<number, string> }

const nonNull = (o: Record<string, unknown>) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== null && v !== undefined));

export async function saveCase(values: CaseFormOutput, base: SaveBase | null, removals: readonly Removal[], opts: { acknowledgeDuplicate?: boolean } = {}): Promise<{ saved: Case; assigned: Assigned }> {
  let c: Case | null = base?.case ?? null;
  const assigned: Assigned = { therapy: {}, outcomes: {} };
  const amendmentReason = values.amendmentReason ?? undefined;
  const step = async (where: string, prefix: string, f: () => Promise<Case>) => {
    try {
      c = await f();
    } catch (err) {
      throw new SaveError(err, c, where, prefix, assigned);
    }
  };
  if (!base) {
    await step('the case', '', () => createCase(<never>{ ...(createBody(values) as object), ...(opts.acknowledgeDuplicate ? { acknowledgeDuplicate: true } : {}) }));
  } else {
    const changed = changedCaseFields(values as CaseFormValues, base.form);
    if (changed.length || values.localIdentifier) {
      await step('the case', '', () => updateCase(base.case.id, {
        version: base.case.version, ...(pick(values as Record<string, unknown>, changed) as object),
        ...(values.localIdentifier ? { localIdentifier: values.localIdentifier } : {}),
        ...(amendmentReason ? { amendmentReason } : {}), ...(opts.acknowledgeDuplicate ? { acknowledgeDuplicate: true } : {}),
      }));
    }
  }
  for (const r of removals) {
    const remove = r.list === 'therapy' ? removeEpisode : removeEvent;
    await step(r.label, '', () => remove(c!.id, r.recordId, { caseVersion: c!.version, reason: r.reason }));
  }
  const lists = [
    { list: 'therapy' as const, names: therapyFieldNames as string[], items: values.therapy as Record<string, unknown>[], create: createEpisode, update: updateEpisode, ids: (x: Case) => x.therapy.map((e) => e.id), label: 'episode' },
    { list: 'outcomes' as const, names: outcomeFieldNames, items: values.outcomes as unknown as Record<string, unknown>[], create: createEvent, update: updateEvent, ids: (x: Case) => x.outcomes.map((e) => e.id), label: 'event' },
  ];
  for (const l of lists) {
    for (let i = 0; i < l.items.length; i++) {
      const item = l.items[i];
      const recordId = item.recordId as string | undefined;
      const where = `${l.label} ${i + 1}`;
      const prefix = `${l.list}.${i}.`;
      if (!recordId) {
        const before = new Set(l.ids(c!));
        await step(where, prefix, () => l.create(c!.id, <never>{ ...nonNull(pick(item, l.names)), caseVersion: c!.version, ...(amendmentReason ? { amendmentReason } : {}) }));
        const made = l.ids(c!).find((id) => !before.has(id));
        if (made) assigned[l.list][i] = made;
      } else {
        const baseItem = (base?.form[l.list] as Record<string, unknown>[] | undefined)?.find((x) => x.recordId === recordId);
        const changed = changedRecordFields(item, baseItem, l.names);
        if (changed.length) await step(where, prefix, () => l.update(c!.id, recordId, <never>{ ...pick(item, changed), caseVersion: c!.version, ...(amendmentReason ? { amendmentReason } : {}) }));
      }
    }
  }
  return { saved: c!, assigned };
}

/** The case inside a 409 version conflict (the server sends the saved case with it). */
export function conflictCase(err: unknown): Case | null {
  if (!(err instanceof ApiError) || err.status !== 409) return null;
  const d = err.details as { current?: Case } | undefined;
  return d?.current && typeof d.current === 'object' && 'version' in d.current ? d.current : null;
}
