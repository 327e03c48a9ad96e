/**
 * The dry run's work, reused by the commit: every row of every recognised sheet read through the
 * mapping and validated with the registry's own schemas (CaseCreateSchema, TherapyEpisodeFormSchema,
 * OutcomeEventFormSchema) and server rules (therapy checks, definition evaluation); rows matched
 * to existing cases by registry case number (updates) or new; therapy and outcome rows tied to
 * their case by the file's case key or a registry number; duplicate warnings from the keyed hash
 * of the hospital identifier plus the surgery date. The identifier is hashed here, in memory, and
 * dropped; it is never part of the plan, a problem or a log line.
 */
import type { DataSource, EntityManager } from 'typeorm';
import { CaseCreateSchema, CASE_FIELDS, LocalIdentifierSchema, type CaseFields } from '../../shared/registry/case.js';
import { TherapyEpisodeFormSchema, type TherapyEpisodeFields } from '../../shared/registry/therapy.js';
import { OutcomeEventFormSchema } from '../../shared/registry/outcome.js';
import { fieldMeta } from '../../shared/registry/meta.js';
import { columnOf, SHEET_NAMES, type RecordKind } from '../../shared/imports/fields.js';
import type { DecimalSeparator, ImportCounts, KindCounts, Mapping, Problem, SheetInfo } from '../../shared/imports/api.js';
import type { TherapyCheckSettings } from '../../shared/clinical/modalities.js';
import type { RegistryWarning } from '../../shared/registry/record.js';
import { identifierHash } from '../registry/identifier-hash.js';
import { THERAPY_COLUMNS, fromDb } from '../registry/columns.js';
import { rowToFields, storedValue } from '../cases/case.repo.js';
import { caseWarnings, computeAriscat } from '../cases/case.rules.js';
import { checkEpisode } from '../therapy/therapy.rules.js';
import { evaluateEvent, type EventEvaluation } from '../outcomes/evaluate.js';
import { isEmptyRow } from './reader.js';
import { kindResolver, recognisedSheets } from './scan.js';
import { mappedColumns, parseRow, problemAt, issuesToProblems, ProblemSink, type MappedColumn, type ParsedRow } from './rows.js';
import type { UploadType } from './file-check.js';

type Db = DataSource | EntityManager;

export interface PlanUser { id: string; email: string; allSites: boolean; siteIds: readonly string[] }

export interface PlanInput {
  db: Db;
  filePath: string;
  fileType: UploadType;
  fileName: string;
  sheets: readonly SheetInfo[];
  mapping: Mapping;
  decimal: DecimalSeparator;
  uploadSiteId: string;
  defaultKind: RecordKind;
  user: PlanUser;
  secret: string;
  today: string;
  therapySettings: TherapyCheckSettings;
  maxProblems: number;
  onProgress?: (p: { parsed?: number; validated?: number; total?: number }) => Promise<void>;
  checkCancelled?: () => Promise<void>;
}

export interface ExistingCase {
  id: string; registryNumber: string; siteId: string; status: string; version: number; fields: CaseFields; identifierHash: string | null;
}

export interface CasePlan {
  row: number;
  key: string | null;
  action: 'new' | 'update' | 'unchanged';
  siteId: string;
  siteCode: string;
  /** The validated fields as entered (haemoglobin as { value, unit }); for updates merged with the stored case. */
  fields: CaseFields;
  existing: ExistingCase | null;
  /** Fields whose value changes (updates). */
  changes: { field: string; oldValue: unknown; newValue: unknown }[];
  /** Keyed hash of the hospital identifier (the identifier itself is not kept). */
  identifierHash: string | null;
  possibleDuplicate: boolean;
  ariscat: { points: number; riskClass: string } | null;
  warnings: RegistryWarning[];
}

export interface ChildPlan<F> {
  row: number;
  action: 'new' | 'unchanged';
  /** The case in this plan (index into `cases`) or an existing case id. */
  caseIndex: number | null;
  caseId: string | null;
  /** The version of the existing case it was checked against (null for a case of this file). */
  caseVersion: number | null;
  fields: F;
  warnings: { path: string; message: string }[];
  evaluation?: EventEvaluation;
}

export type OutcomeFields = { type: string; onsetPostoperativeDay: number; clavienDindo?: string | null; clavienDindoDisability?: boolean | null; notes?: string | null; observations: unknown[] };

export interface Plan {
  cases: CasePlan[];
  therapy: ChildPlan<TherapyEpisodeFields>[];
  outcomes: ChildPlan<OutcomeFields>[];
  problems: Problem[];
  problemCount: number;
  errorCount: number;
  counts: ImportCounts;
}

const CHUNK = 1000;
const emptyCounts = (): KindCounts => ({ rows: 0, new: 0, updated: 0, unchanged: 0, rejected: 0 });
const labelOf = (field: string): string => {
  const s = (CASE_FIELDS as Record<string, unknown>)[field];
  return (s ? fieldMeta(s as never)?.label : undefined) ?? field;
};

/** Stable text of a value, for "unchanged" comparisons (numbers as numbers, arrays in order). */
const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

interface SiteInfo { id: string; code: string; units: Map<string, string> }

async function loadSites(db: Db): Promise<{ byId: Map<string, SiteInfo>; byCode: Map<string, SiteInfo> }> {
  const rows = await db.query(`SELECT s.id, s.code, u.id AS unit_id, u.code AS unit_code FROM sites s LEFT JOIN units u ON u.site_id = s.id AND u.active WHERE s.active`);
  const byId = new Map<string, SiteInfo>();
  for (const r of rows) {
    let s = byId.get(r.id);
    if (!s) byId.set(r.id, (s = { id: r.id, code: r.code, units: new Map() }));
    if (r.unit_id) s.units.set(String(r.unit_code).toUpperCase(), r.unit_id);
  }
  return { byId, byCode: new Map([...byId.values()].map((s) => [s.code.toUpperCase(), s])) };
}

async function loadExistingByNumber(db: Db, numbers: readonly string[]): Promise<Map<string, ExistingCase>> {
  const out = new Map<string, ExistingCase>();
  for (let i = 0; i < numbers.length; i += 5000) {
    const rows = await db.query(`SELECT * FROM surgical_cases WHERE registry_number = ANY($1)`, [numbers.slice(i, i + 5000)]);
    for (const r of rows) out.set(r.registry_number, { id: r.id, registryNumber: r.registry_number, siteId: r.site_id, status: r.status, version: r.version, fields: rowToFields(r), identifierHash: r.identifier_hash });
  }
  return out;
}

/** Existing (site, hash) -> [{ surgeryDate, registryNumber }] for the hashes of a chunk. */
async function loadHashMatches(db: Db, hashes: readonly string[]): Promise<Map<string, { surgeryDate: string; registryNumber: string; id: string }[]>> {
  const out = new Map<string, { surgeryDate: string; registryNumber: string; id: string }[]>();
  if (!hashes.length) return out;
  const rows = await db.query(`SELECT id, site_id, identifier_hash, surgery_date::text AS surgery_date, registry_number FROM surgical_cases WHERE identifier_hash = ANY($1) AND status <> 'withdrawn'`, [hashes]);
  for (const r of rows) {
    const k = `${r.site_id}:${r.identifier_hash}`;
    const list = out.get(k) ?? [];
    list.push({ surgeryDate: r.surgery_date, registryNumber: r.registry_number, id: r.id });
    out.set(k, list);
  }
  return out;
}

interface PendingCase { parsed: ParsedRow; key: string | null; registryNumber: string | null; site: SiteInfo | null; hash: string | null; fields: Record<string, unknown> }
interface PendingChild { kind: 'therapy' | 'outcomes'; sheet: string; parsed: ParsedRow; cols: MappedColumn[]; key: string | null; registryNumber: string | null; fields: Record<string, unknown> }

const IMPORT_ONLY_CASE = ['caseKey', 'registryNumber', 'siteCode', 'unitCode', 'localIdentifier', 'preopHaemoglobin', 'preopHaemoglobinUnit'];

export async function buildPlan(input: PlanInput): Promise<Plan> {
  const { db, user } = input;
  const sink = new ProblemSink(input.maxProblems);
  const sites = await loadSites(db);
  const uploadSite = sites.byId.get(input.uploadSiteId) ?? null;
  const mayUse = (siteId: string) => user.allSites || user.siteIds.includes(siteId);
  const counts: Record<RecordKind, KindCounts> = { cases: emptyCounts(), therapy: emptyCounts(), outcomes: emptyCounts() };
  const cases: CasePlan[] = [];
  const caseIndexByKey = new Map<string, number | 'rejected'>();
  const keyRow = new Map<string, number>();
  const seenHashDate = new Map<string, number>();
  const seenNumbers = new Map<string, number>();
  const children: PendingChild[] = [];
  let parsed = 0;
  let validated = 0;
  const total = input.sheets.reduce((n, s) => n + s.rows, 0);
  const opts = { decimal: input.decimal, today: input.today };
  // Therapy and outcome rows are checked against their case row, so those need the case plans.
  let duplicates = 0;

  const progress = async (force = false) => {
    if (input.onProgress && (force || parsed % 500 === 0)) await input.onProgress({ parsed, validated, total });
  };

  const sheetNames = input.sheets.map((s) => s.sheet);
  const kindFor = kindResolver(input.fileType, sheetNames, input.defaultKind);
  const known = new Map(input.sheets.map((s) => [s.sheet, s]));

  let pending: PendingCase[] = [];
  const flushCases = async (sheet: string, cols: MappedColumn[]) => {
    if (!pending.length) return;
    const numbers = [...new Set(pending.map((p) => p.registryNumber).filter((n): n is string => !!n))];
    const existing = await loadExistingByNumber(db, numbers);
    const hashes = [...new Set(pending.map((p) => p.hash).filter((h): h is string => !!h))];
    const matches = await loadHashMatches(db, hashes);
    const colOf = (path: readonly PropertyKey[]) => {
      const f = String(path[0] ?? '');
      if (f === 'preopHaemoglobin') return cols.find((c) => c.col.key === (path[1] === 'unit' ? 'preopHaemoglobinUnit' : 'preopHaemoglobin')) ?? cols.find((c) => c.col.key === 'preopHaemoglobin');
      if (f === 'unitId') return cols.find((c) => c.col.key === 'unitCode');
      if (f === 'siteId') return cols.find((c) => c.col.key === 'siteCode');
      return cols.find((c) => c.col.key === f);
    };
    for (const p of pending) {
      validated++;
      const reject = () => {
        counts.cases.rejected++;
        if (p.key) caseIndexByKey.set(p.key, 'rejected');
      };
      if (!p.parsed.ok || !p.site) { reject(); continue; }
      let ex: ExistingCase | null = null;
      if (p.registryNumber) {
        ex = existing.get(p.registryNumber) ?? null;
        const numCol = cols.find((c) => c.col.key === 'registryNumber');
        if (!ex || !mayUse(ex.siteId)) {
          sink.add(problemAt(sheet, p.parsed.row, numCol, p.parsed.raw.registryNumber, `no case ${p.registryNumber} at the sites you are assigned to`, 'check the registry case number, or leave it empty to import the row as a new case'));
          reject(); continue;
        }
        if (ex.siteId !== p.site.id) {
          sink.add(problemAt(sheet, p.parsed.row, cols.find((c) => c.col.key === 'siteCode') ?? numCol, p.parsed.raw.siteCode ?? p.parsed.raw.registryNumber, `case ${ex.registryNumber} belongs to another site than the row's site ${p.site.code}`, 'correct the site code, or the registry case number'));
          reject(); continue;
        }
        if (ex.status === 'locked' || ex.status === 'withdrawn') {
          sink.add(problemAt(sheet, p.parsed.row, numCol, p.parsed.raw.registryNumber, `case ${ex.registryNumber} is ${ex.status === 'locked' ? 'locked (its month is closed)' : 'withdrawn'} and cannot be changed by an import`, ex.status === 'locked' ? 'change it in the case form as an amendment with a reason, or remove the row' : 'remove the row, or ask an administrator to reinstate the case'));
          reject(); continue;
        }
      }
      // Empty cells of an update keep the stored value; the merged case is validated as a whole.
      const given = Object.fromEntries(Object.entries(p.fields).filter(([, v]) => v !== null && v !== undefined));
      const merged: Record<string, unknown> = ex ? { ...stripNulls(ex.fields), ...given } : given;
      const r = CaseCreateSchema.safeParse({ siteId: p.site.id, ...merged });
      if (!r.success) {
        issuesToProblems(sheet, p.parsed, r.error.issues, colOf, sink, labelOf);
        reject(); continue;
      }
      const { siteId: _s, localIdentifier: _l, acknowledgeDuplicate: _a, ...fields } = r.data;
      void _s; void _l; void _a;
      const changes: CasePlan['changes'] = [];
      if (ex) {
        for (const [f, v] of Object.entries(given)) {
          const oldV = storedValue(f as never, (ex.fields as Record<string, unknown>)[f]);
          const newV = storedValue(f as never, v);
          if (!same(oldV, newV)) changes.push({ field: f, oldValue: oldV, newValue: newV });
        }
        if (p.hash && p.hash !== ex.identifierHash) changes.push({ field: 'localIdentifier', oldValue: ex.identifierHash ? '(keyed hash recorded)' : null, newValue: '(keyed hash recorded)' });
      }
      let possibleDuplicate = false;
      if (p.hash && !ex) {
        const k = `${p.site.id}:${p.hash}:${fields.surgeryDate}`;
        const others = (matches.get(`${p.site.id}:${p.hash}`) ?? []).filter((m) => m.surgeryDate === fields.surgeryDate);
        const idCol = cols.find((c) => c.col.key === 'localIdentifier');
        if (others.length) {
          possibleDuplicate = true;
          sink.add(problemAt(sheet, p.parsed.row, idCol, undefined, `possible duplicate: the same hospital identifier and surgery date as case ${others.map((o) => o.registryNumber).join(', ')}`, 'check it is not the same operation; if it is, remove the row or give the registry case number to update that case instead', 'warning'));
        } else if (seenHashDate.has(k)) {
          possibleDuplicate = true;
          sink.add(problemAt(sheet, p.parsed.row, idCol, undefined, `possible duplicate: the same hospital identifier and surgery date as row ${seenHashDate.get(k)} of this sheet`, 'check the two rows are different operations; if not, remove one', 'warning'));
        }
        if (possibleDuplicate) duplicates++;
        if (!seenHashDate.has(k)) seenHashDate.set(k, p.parsed.row);
      }
      const ariscat = computeAriscat(fields);
      const warnings = caseWarnings(fields);
      for (const w of warnings) sink.add(problemAt(sheet, p.parsed.row, colOf([w.path]), p.parsed.raw[w.path], w.message, 'this is a warning: the row will be imported; check the values', 'warning'));
      const action: CasePlan['action'] = !ex ? 'new' : changes.length ? 'update' : 'unchanged';
      counts.cases[action === 'new' ? 'new' : action === 'update' ? 'updated' : 'unchanged']++;
      cases.push({ row: p.parsed.row, key: p.key, action, siteId: p.site.id, siteCode: p.site.code, fields: fields as CaseFields, existing: ex, changes, identifierHash: p.hash ?? ex?.identifierHash ?? null, possibleDuplicate, ariscat: ariscat ? { points: ariscat.points, riskClass: ariscat.riskClass } : null, warnings });
      if (p.key) caseIndexByKey.set(p.key, cases.length - 1);
    }
    pending = [];
    await progress(true);
    await input.checkCancelled?.();
  };

  for await (const sheet of recognisedSheets(input.filePath, input.fileType, kindFor, input.fileName)) {
    const info = known.get(sheet.name) ?? (input.fileType === 'csv' ? input.sheets[0] : undefined);
    if (!info) { for await (const _ of sheet.rows) void _; continue; }
    const kind = sheet.kind;
    const cols = mappedColumns(kind, info.headers, input.mapping[kind] ?? {});
    const colByKey = new Map(cols.map((c) => [c.col.key, c]));
    let header = true;
    for await (const raw of sheet.rows) {
      if (header) { if (!isEmptyRow(raw.values)) header = false; continue; }
      if (isEmptyRow(raw.values)) continue;
      parsed++;
      counts[kind].rows++;
      const pr = parseRow(sheet.name, raw.number, raw.values, cols, opts, sink);
      const key = typeof pr.values.caseKey === 'string' ? pr.values.caseKey : null;
      const registryNumber = typeof pr.values.registryNumber === 'string' ? pr.values.registryNumber.toUpperCase() : null;
      if (kind === 'cases') {
        const pc = parseCaseRow(sheet.name, pr, colByKey, { uploadSite, sites, mayUse, secret: input.secret, sink });
        if (key) {
          if (keyRow.has(key)) {
            sink.add(problemAt(sheet.name, pr.row, colByKey.get('caseKey'), pr.raw.caseKey, `the case key "${key}" is used twice (rows ${keyRow.get(key)} and ${pr.row})`, 'give every case row its own case key'));
            pc.parsed.ok = false;
          } else keyRow.set(key, pr.row);
        }
        if (registryNumber) {
          if (seenNumbers.has(registryNumber)) {
            sink.add(problemAt(sheet.name, pr.row, colByKey.get('registryNumber'), pr.raw.registryNumber, `registry case number ${registryNumber} appears twice (rows ${seenNumbers.get(registryNumber)} and ${pr.row})`, 'keep one row per case'));
            pc.parsed.ok = false;
          } else seenNumbers.set(registryNumber, pr.row);
        }
        pending.push({ ...pc, key, registryNumber });
        if (pending.length >= CHUNK) await flushCases(sheet.name, cols);
      } else {
        const fields = { ...pr.values };
        delete fields.caseKey;
        delete fields.registryNumber;
        children.push({ kind, sheet: sheet.name, parsed: pr, cols, key, registryNumber, fields });
        if (parsed % 500 === 0) await progress();
      }
    }
    if (kind === 'cases') await flushCases(sheet.name, cols);
  }

  // Therapy and outcome rows: tie each to its case, then validate with the case in view.
  const linkNumbers = [...new Set(children.map((c) => (c.key ? null : c.registryNumber)).filter((n): n is string => !!n))];
  const linked = await loadExistingByNumber(db, linkNumbers);
  const existingIds = [...new Set([...linked.values()].map((e) => e.id).concat(cases.filter((c) => c.existing).map((c) => c.existing!.id)))];
  const existingEpisodes = await loadSignatures(db, 'therapy', existingIds);
  const existingEvents = await loadSignatures(db, 'outcomes', existingIds);
  const therapy: ChildPlan<TherapyEpisodeFields>[] = [];
  const outcomes: ChildPlan<OutcomeFields>[] = [];
  for (const ch of children) {
    validated++;
    const kc = counts[ch.kind];
    const col = (k: string) => ch.cols.find((c) => c.col.key === k);
    const reject = () => { kc.rejected++; };
    if (!ch.parsed.ok) { reject(); continue; }
    let caseIndex: number | null = null;
    let ex: ExistingCase | null = null;
    if (ch.key) {
      const idx = caseIndexByKey.get(ch.key);
      if (idx === undefined) {
        sink.add(problemAt(ch.sheet, ch.parsed.row, col('caseKey'), ch.parsed.raw.caseKey, `no case row with the case key "${ch.key}" in the ${SHEET_NAMES.cases} sheet`, 'use the case key of a case row of this file, or the registry case number of an existing case'));
        reject(); continue;
      }
      if (idx === 'rejected') {
        sink.add(problemAt(ch.sheet, ch.parsed.row, col('caseKey'), ch.parsed.raw.caseKey, `its case (case key "${ch.key}") was rejected`, 'fix the problems of that case row first'));
        reject(); continue;
      }
      caseIndex = idx;
      ex = cases[idx].existing;
    } else if (ch.registryNumber) {
      ex = linked.get(ch.registryNumber) ?? null;
      if (!ex || !mayUse(ex.siteId)) {
        sink.add(problemAt(ch.sheet, ch.parsed.row, col('registryNumber'), ch.parsed.raw.registryNumber, `no case ${ch.registryNumber} at the sites you are assigned to`, 'check the registry case number'));
        reject(); continue;
      }
      if (ex.status === 'locked' || ex.status === 'withdrawn') {
        sink.add(problemAt(ch.sheet, ch.parsed.row, col('registryNumber'), ch.parsed.raw.registryNumber, `case ${ex.registryNumber} is ${ex.status} and cannot be changed by an import`, 'add it in the case form (as an amendment with a reason), or remove the row'));
        reject(); continue;
      }
    } else {
      sink.add(problemAt(ch.sheet, ch.parsed.row, col('caseKey'), undefined, 'the row names no case', 'fill in the case key of its case row, or the registry case number of an existing case'));
      reject(); continue;
    }
    const kase = caseIndex !== null ? cases[caseIndex].fields : ex!.fields;
    const caseId = caseIndex !== null ? cases[caseIndex].existing?.id ?? null : ex!.id;
    const colOf = (path: readonly PropertyKey[]) => col(String(path[0] ?? ''));
    const given = Object.fromEntries(Object.entries(ch.fields).filter(([, v]) => v !== null && v !== undefined));
    if (ch.kind === 'therapy') {
      const r = TherapyEpisodeFormSchema.safeParse(given);
      if (!r.success) { issuesToProblems(ch.sheet, ch.parsed, r.error.issues, colOf, sink, (f) => columnOf('therapy', f)?.label ?? f); reject(); continue; }
      const chk = checkEpisode(r.data, kase, input.therapySettings);
      if (chk.errors.length) {
        for (const e of chk.errors) sink.add(problemAt(ch.sheet, ch.parsed.row, col(e.path), ch.parsed.raw[e.path], e.message, 'correct the value for this modality (see the Data dictionary sheet)'));
        reject(); continue;
      }
      for (const w of chk.warnings) sink.add(problemAt(ch.sheet, ch.parsed.row, col(w.path), ch.parsed.raw[w.path], w.message, 'a warning: the row will be imported', 'warning'));
      const sig = episodeSignature(chk.fields);
      const action = caseId && existingEpisodes.get(caseId)?.has(sig) ? 'unchanged' : 'new';
      kc[action === 'new' ? 'new' : 'unchanged']++;
      therapy.push({ row: ch.parsed.row, action, caseIndex, caseId, caseVersion: ex?.version ?? null, fields: chk.fields, warnings: chk.warnings });
    } else {
      const r = OutcomeEventFormSchema.safeParse(given);
      if (!r.success) { issuesToProblems(ch.sheet, ch.parsed, r.error.issues, colOf, sink, (f) => columnOf('outcomes', f)?.label ?? f); reject(); continue; }
      const ev = r.data as OutcomeFields;
      let evaluation: EventEvaluation;
      try {
        evaluation = evaluateEvent({ type: ev.type as never, observations: [] }, { admissionDate: kase.admissionDate, surgeryDate: kase.surgeryDate as string, age: kase.age, copd: kase.copd, heartFailure: kase.heartFailure });
      } catch (e) {
        sink.add(problemAt(ch.sheet, ch.parsed.row, col('type'), ch.parsed.raw.type, `the event could not be evaluated: ${(e as Error).message}`, 'check the event and its case'));
        reject(); continue;
      }
      const sig = eventSignature(ev);
      const action = caseId && existingEvents.get(caseId)?.has(sig) ? 'unchanged' : 'new';
      kc[action === 'new' ? 'new' : 'unchanged']++;
      outcomes.push({ row: ch.parsed.row, action, caseIndex, caseId, caseVersion: ex?.version ?? null, fields: ev, warnings: [], evaluation });
    }
  }
  await progress(true);

  const sum = (k: keyof KindCounts) => counts.cases[k] + counts.therapy[k] + counts.outcomes[k];
  const byKind = Object.fromEntries(input.sheets.map((s) => [s.kind, counts[s.kind]]));
  return {
    cases, therapy, outcomes,
    problems: sink.list, problemCount: sink.count, errorCount: sink.errors,
    counts: { rows: sum('rows'), new: sum('new'), updated: sum('updated'), unchanged: sum('unchanged'), rejected: sum('rejected'), warnings: sink.warnings, duplicates, byKind },
  };
}

function stripNulls(o: object): Record<string, unknown> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== null && v !== undefined));
}

/** Case row: site (the row's or the upload's; only the user's sites), unit code, identifier hashed. */
function parseCaseRow(
  sheet: string, pr: ParsedRow, colByKey: Map<string, MappedColumn>,
  ctx: { uploadSite: SiteInfo | null; sites: { byCode: Map<string, SiteInfo> }; mayUse: (id: string) => boolean; secret: string; sink: ProblemSink },
): Omit<PendingCase, 'key' | 'registryNumber'> {
  const v = pr.values;
  let site = ctx.uploadSite;
  if (typeof v.siteCode === 'string' && v.siteCode) {
    const s = ctx.sites.byCode.get(v.siteCode.toUpperCase());
    if (!s) {
      ctx.sink.add(problemAt(sheet, pr.row, colByKey.get('siteCode'), pr.raw.siteCode, `no active site has the code "${v.siteCode}"`, 'use the site code shown on the Sites page (e.g. HBR), or leave it empty for the site chosen at upload'));
      pr.ok = false;
      site = null;
    } else site = s;
  }
  if (site && !ctx.mayUse(site.id)) {
    ctx.sink.add(problemAt(sheet, pr.row, colByKey.get('siteCode'), pr.raw.siteCode, `the row belongs to site ${site.code}, which you are not assigned to`, 'remove the row, or ask an abstractor of that site to import it'));
    pr.ok = false;
    site = null;
  }
  const fields: Record<string, unknown> = {};
  for (const [k, val] of Object.entries(v)) if (!IMPORT_ONLY_CASE.includes(k)) fields[k] = val;
  if (typeof v.unitCode === 'string' && v.unitCode && site) {
    const unitId = site.units.get(v.unitCode.toUpperCase());
    if (!unitId) {
      ctx.sink.add(problemAt(sheet, pr.row, colByKey.get('unitCode'), pr.raw.unitCode, `site ${site.code} has no unit with the code "${v.unitCode}"`, `use one of: ${[...site.units.keys()].join(', ')}`));
      pr.ok = false;
    } else fields.unitId = unitId;
  }
  if (typeof v.preopHaemoglobin === 'number') fields.preopHaemoglobin = { value: v.preopHaemoglobin, unit: (v.preopHaemoglobinUnit as string) ?? 'g/dL' };
  let hash: string | null = null;
  if (typeof v.localIdentifier === 'string' && v.localIdentifier && site) {
    const idOk = LocalIdentifierSchema.safeParse(v.localIdentifier);
    if (!idOk.success) {
      ctx.sink.add(problemAt(sheet, pr.row, colByKey.get('localIdentifier'), undefined, `Hospital identifier: ${idOk.error.issues[0].message}`, 'shorten or correct the identifier (it is hashed and never stored)'));
      pr.ok = false;
    } else hash = identifierHash(ctx.secret, site.id, idOk.data);
  }
  // The identifier's text leaves memory with the row: it is not part of the plan.
  delete pr.values.localIdentifier;
  delete pr.raw.localIdentifier;
  return { parsed: pr, site, hash, fields };
}

function episodeSignature(f: Partial<TherapyEpisodeFields>): string {
  return JSON.stringify(Object.keys(THERAPY_COLUMNS).map((k) => (f as Record<string, unknown>)[k] ?? null));
}
function eventSignature(e: Partial<OutcomeFields>): string {
  return JSON.stringify([e.type, e.onsetPostoperativeDay, e.clavienDindo ?? null, e.clavienDindoDisability ?? null, e.notes ?? null]);
}

/** Signatures of the current episodes or events of existing cases (for "unchanged"). */
async function loadSignatures(db: Db, kind: 'therapy' | 'outcomes', caseIds: readonly string[]): Promise<Map<string, Set<string>>> {
  const out = new Map<string, Set<string>>();
  for (let i = 0; i < caseIds.length; i += 5000) {
    const ids = caseIds.slice(i, i + 5000);
    const rows = await db.query(kind === 'therapy' ? `SELECT * FROM therapy_episodes WHERE case_id = ANY($1) AND removed_at IS NULL` : `SELECT * FROM outcome_events WHERE case_id = ANY($1) AND removed_at IS NULL`, [ids]);
    for (const r of rows) {
      let sig: string;
      if (kind === 'therapy') {
        const f: Record<string, unknown> = {};
        for (const [name, spec] of Object.entries(THERAPY_COLUMNS)) f[name] = fromDb(spec.kind, r[spec.column]);
        sig = episodeSignature(f as Partial<TherapyEpisodeFields>);
      } else {
        sig = eventSignature({ type: r.type, onsetPostoperativeDay: r.onset_postoperative_day, clavienDindo: r.clavien_dindo, clavienDindoDisability: r.clavien_dindo_disability, notes: r.notes });
      }
      const set = out.get(r.case_id) ?? new Set<string>();
      set.add(sig);
      out.set(r.case_id, set);
    }
  }
  return out;
}

