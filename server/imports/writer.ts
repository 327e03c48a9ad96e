/**
 * Writes a validated plan inside the caller's transaction: new cases (registry numbers from the
 * registry's own numbering, serialised per site and year), updates of existing cases (audited as
 * 'import', verified cases back to complete), therapy episodes and outcome events. Batched
 * multi-row statements keep a 50,000-row commit fast; progress is reported after each batch from
 * inside the transaction, so a crash mid-way leaves nothing but those counters.
 */
import { randomUUID } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { CASE_FIELD_NAMES, type CaseFieldName } from '../../shared/registry/case.js';
import type { TherapyFieldName } from '../../shared/registry/therapy.js';
import type { ExistingPolicy } from '../../shared/imports/api.js';
import { audit, type AuditInput } from '../audit/audit.service.js';
import { AppError } from '../http/errors.js';
import { CASE_COLUMNS, THERAPY_COLUMNS } from '../registry/columns.js';
import { formatRegistryNumber, nextRegistryNumber, storedValue } from '../cases/case.repo.js';
import type { Plan, PlanUser } from './plan.js';

/** From this many rows an import refreshes the analysis tables set-wise (see writePlan). */
export const BULK_REFRESH_ROWS = 200;

export interface WriteResult { casesCreated: number; casesUpdated: number; therapyAdded: number; outcomesAdded: number; skipped: number; written: number; registryNumbers: { row: number; registryNumber: string }[] }

async function insertRows(tx: EntityManager, table: string, columns: readonly string[], rows: readonly unknown[][]): Promise<void> {
  if (!rows.length) return;
  const params: unknown[] = [];
  const tuples = rows.map((r) => `(${r.map((v) => { params.push(v); return `$${params.length}`; }).join(', ')})`);
  await tx.query(`INSERT INTO ${table} (${columns.map((c) => `"${c}"`).join(', ')}) VALUES ${tuples.join(', ')}`, params);
}

const typeCache = new Map<string, Map<string, string>>();
/** Element types of a table's columns (udt names: int4, text, date, uuid, jsonb, ...). */
async function columnTypes(tx: EntityManager, table: string): Promise<Map<string, string>> {
  let m = typeCache.get(table);
  if (!m) {
    const rows: { column_name: string; udt_name: string }[] = await tx.query(`SELECT column_name, udt_name FROM information_schema.columns WHERE table_schema = 'public' AND table_name = $1`, [table]);
    m = new Map(rows.map((r) => [r.column_name, r.udt_name]));
    typeCache.set(table, m);
  }
  return m;
}

/**
 * Many rows in one statement with one array parameter per column (INSERT ... SELECT FROM unnest):
 * the statement stays small however many rows, which is much cheaper to parse than VALUES lists.
 * For tables without array columns only.
 */
async function insertColumns(tx: EntityManager, table: string, columns: readonly string[], rows: readonly unknown[][]): Promise<void> {
  if (!rows.length) return;
  const types = await columnTypes(tx, table);
  const arrays = columns.map((_, i) => rows.map((r) => r[i] ?? null));
  const casts = columns.map((c, i) => {
    const t = types.get(c);
    if (!t || t.startsWith('_')) throw new Error(`insertColumns: ${table}.${c} is unknown or an array column`);
    return `$${i + 1}::${t}[]`;
  });
  await tx.query(`INSERT INTO ${table} (${columns.map((c) => `"${c}"`).join(', ')}) SELECT * FROM unnest(${casts.join(', ')})`, arrays);
}

/** Allocates `n` consecutive registry numbers of a site and year (the advisory lock is held to commit). */
async function allocateNumbers(tx: EntityManager, siteId: string, siteCode: string, year: number, n: number): Promise<string[]> {
  const first = await nextRegistryNumber(tx, siteId, siteCode, year);
  const out = [first.number];
  for (let i = 1; i < n; i++) out.push(formatRegistryNumber(siteCode, year, first.seq + i));
  return out;
}

export async function writePlan(
  tx: EntityManager,
  plan: Plan,
  opts: { importId: string; user: PlanUser; policy: ExistingPolicy; year: number; batchRows: number; progress: (written: number) => Promise<void> },
): Promise<WriteResult> {
  const { user, importId } = opts;
  const batch = Math.max(1, opts.batchRows);
  let written = 0;
  let skipped = 0;
  const base = { actorId: user.id, actorEmail: user.email, ip: null, entity: 'case' };
  const result: WriteResult = { casesCreated: 0, casesUpdated: 0, therapyAdded: 0, outcomesAdded: 0, skipped: 0, written: 0, registryNumbers: [] };
  // A large import skips the analysis row triggers (a round of them per case, episode and event)
  // and refreshes the fact rows and roll-ups of every touched case set-wise at the end, still
  // inside the transaction; a small one keeps the triggers, which are cheaper for a few rows.
  const bulk = plan.cases.length + plan.therapy.length + plan.outcomes.length >= BULK_REFRESH_ROWS;
  if (bulk) await tx.query(`SELECT set_config('alveolog.analysis_bulk', 'on', true)`);

  // --- New cases -------------------------------------------------------------------------
  const fresh = plan.cases.map((c, i) => ({ c, i })).filter((x) => x.c.action === 'new');
  const caseIds = new Map<number, string>(); // plan index -> case id (new or existing)
  plan.cases.forEach((c, i) => { if (c.existing) caseIds.set(i, c.existing.id); });
  const numbers = new Map<number, string>();
  const bySite = new Map<string, typeof fresh>();
  for (const x of fresh) {
    const list = bySite.get(x.c.siteId);
    if (list) list.push(x);
    else bySite.set(x.c.siteId, [x]);
  }
  for (const list of bySite.values()) {
    const nums = await allocateNumbers(tx, list[0].c.siteId, list[0].c.siteCode, opts.year, list.length);
    list.forEach((x, k) => numbers.set(x.i, nums[k]));
  }
  const fieldCols = CASE_FIELD_NAMES.map((n) => CASE_COLUMNS[n].column);
  const caseCols = ['id', 'registry_number', 'registry_year', 'registry_seq', 'site_id', 'status', 'created_via', 'ariscat_points', 'ariscat_class', 'identifier_hash', 'possible_duplicate', 'warnings', 'created_by', 'updated_by', ...fieldCols];
  for (let s = 0; s < fresh.length; s += batch) {
    const chunk = fresh.slice(s, s + batch);
    const rows: unknown[][] = [];
    const entries: AuditInput[] = [];
    for (const { c, i } of chunk) {
      const id = randomUUID();
      caseIds.set(i, id);
      const number = numbers.get(i)!;
      const seq = Number(number.slice(number.lastIndexOf('-') + 1));
      rows.push([id, number, opts.year, seq, c.siteId, 'draft', 'import', c.ariscat?.points ?? null, c.ariscat?.riskClass ?? null, c.identifierHash, c.possibleDuplicate, JSON.stringify(c.warnings), user.id, user.id,
        ...CASE_FIELD_NAMES.map((n) => storedValue(n, (c.fields as Record<string, unknown>)[n]))]);
      entries.push({ ...base, action: 'case-created', entityId: id, field: 'registryNumber', newValue: number, details: { via: 'import', importId, row: c.row, siteId: c.siteId } });
      result.registryNumbers.push({ row: c.row, registryNumber: number });
    }
    await insertColumns(tx, 'surgical_cases', caseCols, rows);
    await audit(tx, entries);
    written += chunk.length;
    result.casesCreated += chunk.length;
    await opts.progress(written);
  }

  // --- Updates of existing cases ------------------------------------------------------------
  const touched = new Set<string>();
  const skippedCases = new Set<number>();
  const updates = plan.cases.map((c, i) => ({ c, i })).filter((x) => x.c.action === 'update');
  if (opts.policy === 'skip') {
    updates.forEach((x) => skippedCases.add(x.i));
    skipped += updates.length;
  } else {
    let sinceProgress = 0;
    for (const { c } of updates) {
      const ex = c.existing!;
      const sets: string[] = [];
      const params: unknown[] = [ex.id, ex.version];
      for (const ch of c.changes) {
        if (ch.field === 'localIdentifier') { params.push(c.identifierHash); sets.push(`identifier_hash = $${params.length}`); continue; }
        params.push(ch.newValue);
        sets.push(`"${CASE_COLUMNS[ch.field as CaseFieldName].column}" = $${params.length}`);
      }
      params.push(c.ariscat?.points ?? null, c.ariscat?.riskClass ?? null, JSON.stringify(c.warnings));
      sets.push(`ariscat_points = $${params.length - 2}`, `ariscat_class = $${params.length - 1}`, `warnings = $${params.length}`);
      const res = await tx.query(`UPDATE surgical_cases SET ${sets.join(', ')} WHERE id = $1 AND version = $2 AND status NOT IN ('locked', 'withdrawn') RETURNING id`, params);
      const rows = Array.isArray(res[0]) ? res[0] : res;
      if (!rows.length) {
        throw new AppError(409, 'changed_since_dry_run', `case ${ex.registryNumber} (row ${c.row}) was changed, locked or withdrawn after the dry run`, { hint: 'run the dry run again and commit its result; nothing was imported' });
      }
      touched.add(ex.id);
      await audit(tx, c.changes.map((ch) => ({ ...base, action: 'import', entityId: ex.id, field: ch.field, oldValue: ch.oldValue, newValue: ch.newValue, details: { importId, row: c.row } })));
      written++;
      result.casesUpdated++;
      if (++sinceProgress >= batch) { sinceProgress = 0; await opts.progress(written); }
    }
    await opts.progress(written);
  }

  // --- Therapy episodes and outcome events ------------------------------------------------
  const targetOf = (caseIndex: number | null, caseId: string | null): string | null => {
    if (caseIndex !== null) {
      const c = plan.cases[caseIndex];
      if (c.existing && opts.policy === 'skip') return null;
      return caseIds.get(caseIndex) ?? null;
    }
    return opts.policy === 'skip' ? null : caseId;
  };
  const existingIds = new Set(plan.cases.filter((c) => c.existing).map((c) => c.existing!.id));
  const isExisting = (id: string, caseIndex: number | null) => caseIndex === null || existingIds.has(id);

  const tNames = Object.keys(THERAPY_COLUMNS) as TherapyFieldName[];
  const tCols = ['id', 'case_id', 'created_by', 'warnings', ...tNames.map((n) => THERAPY_COLUMNS[n].column)];
  const newTherapy = plan.therapy.filter((t) => t.action === 'new');
  for (let s = 0; s < newTherapy.length; s += batch) {
    const rows: unknown[][] = [];
    const entries: AuditInput[] = [];
    for (const t of newTherapy.slice(s, s + batch)) {
      const caseId = targetOf(t.caseIndex, t.caseId);
      if (!caseId) { skipped++; continue; }
      const id = randomUUID();
      rows.push([id, caseId, user.id, JSON.stringify(t.warnings), ...tNames.map((n) => (t.fields as Record<string, unknown>)[n] ?? null)]);
      entries.push({ ...base, action: isExisting(caseId, t.caseIndex) ? 'import' : 'therapy-added', entityId: caseId, field: `therapy.${id}`, newValue: t.fields.modality, details: { via: 'import', importId, row: t.row, episodeId: id } });
      if (isExisting(caseId, t.caseIndex)) touched.add(caseId);
    }
    await insertRows(tx, 'therapy_episodes', tCols, rows);
    await audit(tx, entries);
    written += rows.length;
    result.therapyAdded += rows.length;
    await opts.progress(written);
  }
  const oCols = ['id', 'case_id', 'type', 'onset_postoperative_day', 'clavien_dindo', 'clavien_dindo_disability', 'observations', 'notes', 'definition', 'definition_version', 'evaluations', 'pneumonia_nhsn_met', 'created_by'];
  const newOutcomes = plan.outcomes.filter((o) => o.action === 'new');
  for (let s = 0; s < newOutcomes.length; s += batch) {
    const rows: unknown[][] = [];
    const entries: AuditInput[] = [];
    for (const o of newOutcomes.slice(s, s + batch)) {
      const caseId = targetOf(o.caseIndex, o.caseId);
      if (!caseId) { skipped++; continue; }
      const id = randomUUID();
      const ev = o.evaluation!;
      rows.push([id, caseId, o.fields.type, o.fields.onsetPostoperativeDay, o.fields.clavienDindo ?? null, o.fields.clavienDindoDisability ?? null, '[]', o.fields.notes ?? null, ev.definition, ev.definitionVersion, JSON.stringify(ev.evaluations), ev.pneumoniaNhsnMet, user.id]);
      entries.push({ ...base, action: isExisting(caseId, o.caseIndex) ? 'import' : 'outcome-added', entityId: caseId, field: `outcomes.${id}.type`, newValue: o.fields.type, details: { via: 'import', importId, row: o.row, eventId: id } });
      if (isExisting(caseId, o.caseIndex)) touched.add(caseId);
    }
    await insertRows(tx, 'outcome_events', oCols, rows);
    await audit(tx, entries);
    written += rows.length;
    result.outcomesAdded += rows.length;
    await opts.progress(written);
  }

  // Any change to an existing case raises its version; a verified case goes back to complete.
  const ids = [...touched];
  for (let s = 0; s < ids.length; s += 5000) {
    const chunk = ids.slice(s, s + 5000);
    const verified = (await tx.query(`SELECT id FROM surgical_cases WHERE id = ANY($1) AND status = 'verified'`, [chunk])) as { id: string }[];
    await tx.query(
      `UPDATE surgical_cases SET version = version + 1, updated_at = now(), updated_by = $2,
              editors_since_verification = CASE WHEN $2 = ANY(editors_since_verification) THEN editors_since_verification ELSE array_append(editors_since_verification, $2) END,
              status = CASE WHEN status = 'verified' THEN 'complete' ELSE status END,
              verified_by = CASE WHEN status = 'verified' THEN NULL ELSE verified_by END,
              verified_at = CASE WHEN status = 'verified' THEN NULL ELSE verified_at END
        WHERE id = ANY($1)`,
      [chunk, user.id],
    );
    if (verified.length) await audit(tx, verified.map((r) => ({ ...base, action: 'status-changed', entityId: r.id, field: 'status', oldValue: 'verified', newValue: 'complete', reason: 'changed by an import after verification: needs verifying again', details: { importId } })));
  }
  if (bulk) {
    const refresh = [...new Set([...caseIds.values(), ...touched])];
    for (let s = 0; s < refresh.length; s += 20_000) await tx.query(`SELECT analysis_refresh_cases($1::uuid[])`, [refresh.slice(s, s + 20_000)]);
    await tx.query(`SELECT set_config('alveolog.analysis_bulk', 'off', true)`);
  }
  result.skipped = skipped;
  result.written = written;
  return result;
}
