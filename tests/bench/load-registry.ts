/**
 * Loads a synthetic registry of N cases (default 1,000,000) of realistic width (every field of
 * surgical_cases filled as the registry would, plus outcome events and therapy episodes) into
 * the benchmark database with COPY (pg-copy-streams), then rebuilds the analysis tables set-wise.
 *
 * The scenario is our own invention on the demo network's fictional sites: five years of
 * surgery (2021-2025), ARISCAT from generated patient factors (analysis/clinical), PPC risk by
 * ARISCAT class in the published range (Canet 2010: about 1.6% / 13.3% / 42.1%), a lung-expansion
 * protocol starting at each site's protocolStart that lowers the risk a little.
 */
import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { ariscatScore } from '../../analysis/clinical/ariscat.js';
import { INCISION_SITE_TO_ARISCAT, type IncisionSite } from '../../shared/clinical/codes.js';
import { SITES } from '../../server/db/seed/scenario.js';
import { mulberry32 } from '../../analysis/random/mulberry32.js';


const CATEGORIES: { category: string; incision: IncisionSite[]; weight: number; minutes: number; unit: string }[] = [
  { category: 'upper-gastrointestinal', incision: ['upper-abdominal', 'thoraco-abdominal'], weight: 6, minutes: 220, unit: 'SURG-A' },
  { category: 'hepatobiliary-pancreatic', incision: ['upper-abdominal'], weight: 6, minutes: 240, unit: 'SURG-A' },
  { category: 'colorectal', incision: ['lower-abdominal', 'upper-and-lower-abdominal'], weight: 14, minutes: 180, unit: 'SURG-B' },
  { category: 'abdominal-wall-hernia', incision: ['lower-abdominal', 'upper-abdominal'], weight: 10, minutes: 80, unit: 'SURG-B' },
  { category: 'thoracic', incision: ['intrathoracic'], weight: 5, minutes: 200, unit: 'SURG-A' },
  { category: 'cardiac', incision: ['intrathoracic'], weight: 4, minutes: 260, unit: 'ICU' },
  { category: 'vascular', incision: ['peripheral', 'lower-abdominal'], weight: 5, minutes: 150, unit: 'SURG-B' },
  { category: 'orthopaedic', incision: ['peripheral'], weight: 20, minutes: 110, unit: 'ORTHO' },
  { category: 'spinal', incision: ['spine'], weight: 5, minutes: 170, unit: 'ORTHO' },
  { category: 'urological', incision: ['lower-abdominal', 'peripheral'], weight: 8, minutes: 120, unit: 'SURG-B' },
  { category: 'gynaecological', incision: ['lower-abdominal'], weight: 7, minutes: 110, unit: 'SURG-B' },
  { category: 'head-and-neck', incision: ['head-neck'], weight: 4, minutes: 150, unit: 'SURG-A' },
  { category: 'neurosurgical', incision: ['intracranial'], weight: 2, minutes: 210, unit: 'ICU' },
  { category: 'breast-and-plastic', incision: ['chest-wall-breast', 'peripheral'], weight: 4, minutes: 100, unit: 'SURG-B' },
];
const TOTAL_WEIGHT = CATEGORIES.reduce((s, c) => s + c.weight, 0);
const CLASS_RISK = { low: 0.016, intermediate: 0.133, high: 0.421 };
const PPC_TYPES = ['atelectasis', 'respiratory-infection', 'respiratory-failure', 'bronchospasm', 'pleural-effusion', 'pneumothorax', 'aspiration-pneumonitis'];
const MODALITIES = ['incentive-spirometry', 'pep', 'pap-device', 'cpap', 'ippb', 'chest-physiotherapy', 'early-mobilisation'];

const iso = (d: Date) => d.toISOString().slice(0, 10);
const addDays = (d: Date, k: number) => new Date(d.getTime() + k * 86400000);
const csv = (v: unknown): string => {
  if (v === null || v === undefined) return '\\N';
  if (typeof v === 'boolean') return v ? 't' : 'f';
  const s = String(v);
  return /[\t\n\\]/.test(s) ? s.replace(/\\/g, '\\\\').replace(/\t/g, '\\t').replace(/\n/g, '\\n') : s;
};

/** One COPY ... FROM STDIN stream on its own connection, written row by row with back-pressure. */
class CopyWriter {
  private buf: string[] = [];
  private done: Promise<void>;
  private stream: ReturnType<typeof copyFrom>;
  count = 0;
  constructor(client: pg.Client, table: string, columns: string[]) {
    this.stream = client.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN`));
    this.done = new Promise<void>((resolve, reject) => { this.stream.on('finish', resolve); this.stream.on('error', reject); });
  }
  async write(row: unknown[]): Promise<void> {
    this.buf.push(row.map(csv).join('\t'));
    this.count++;
    if (this.buf.length >= 2000) await this.flush();
  }
  private async flush(): Promise<void> {
    if (!this.buf.length) return;
    const ok = this.stream.write(this.buf.join('\n') + '\n');
    this.buf = [];
    if (!ok) await new Promise((res) => this.stream.once('drain', res));
  }
  async end(): Promise<number> {
    await this.flush();
    this.stream.end();
    await this.done;
    return this.count;
  }
}

export interface LoadResult { cases: number; events: number; episodes: number; seconds: number }

/**
 * @param superUrl a superuser connection to the benchmark database (COPY with triggers off:
 *   session_replication_role = replica; the analysis tables are rebuilt afterwards)
 */
export async function loadRegistry(superUrl: string, opts: { cases?: number; seed?: number; log?: (m: string) => void } = {}): Promise<LoadResult> {
  const N = opts.cases ?? 1_000_000;
  const log = opts.log ?? (() => undefined);
  const rnd = mulberry32(opts.seed ?? 20261201);
  const t0 = Date.now();
  const client = new pg.Client({ connectionString: superUrl });
  const evClient = new pg.Client({ connectionString: superUrl });
  const epClient = new pg.Client({ connectionString: superUrl });
  await Promise.all([client.connect(), evClient.connect(), epClient.connect()]);
  try {
    const sites = (await client.query(`SELECT id::text, code FROM sites`)).rows as { id: string; code: string }[];
    const units = (await client.query(`SELECT id::text, site_id::text, code FROM units`)).rows as { id: string; site_id: string; code: string }[];
    const users = (await client.query(`SELECT id::text FROM users ORDER BY email`)).rows as { id: string }[];
    const scenario = SITES.filter((s) => sites.some((x) => x.code === s.code));
    if (!scenario.length) throw new Error('the benchmark database has no demo sites: run the demo seed first');
    const weights = scenario.map((s) => s.size);
    const wsum = weights.reduce((a, b) => a + b, 0);
    const siteOf = new Map(sites.map((s) => [s.code, s.id]));
    const unitOf = new Map(units.map((u) => [`${u.site_id}:${u.code}`, u.id]));
    const seqs = new Map<string, number>();
    const start = Date.UTC(2021, 0, 1);
    const days = 1826;
    // Triggers (foreign keys and the analysis triggers) are off for the load; analysis_rebuild() follows.
    for (const c of [client, evClient, epClient]) await c.query(`SET session_replication_role = replica`);

    const caseCols = ['id', 'registry_number', 'registry_year', 'registry_seq', 'site_id', 'unit_id', 'status', 'version', 'created_via', 'eligible', 'exclusion_reason',
      'admission_date', 'age', 'sex', 'height_cm', 'weight_kg', 'asa_class', 'asa_emergency', 'smoking_status', 'copd', 'obstructive_sleep_apnoea', 'heart_failure',
      'preop_spo2', 'preop_haemoglobin_g_dl', 'respiratory_infection_last_month', 'functional_status', 'surgery_date', 'procedure_category', 'incision_site', 'approach',
      'urgency', 'anaesthesia', 'duration_minutes', 'ariscat_points', 'ariscat_class', 'therapy_given', 'complications_reviewed', 'discharge_date', 'icu_days',
      'ventilator_days', 'readmitted_30d', 'readmission_cause', 'died_30d', 'death_date', 'follow_up_completed_on', 'notes', 'identifier_hash', 'possible_duplicate',
      'warnings', 'created_by', 'created_at', 'updated_by', 'updated_at', 'editors_since_verification', 'completed_at', 'verified_by', 'verified_at', 'locked_by',
      'locked_at', 'withdrawn_by', 'withdrawn_at', 'withdrawn_reason'];
    const caseW = new CopyWriter(client, 'surgical_cases', caseCols);
    const eventW = new CopyWriter(evClient, 'outcome_events', ['id', 'case_id', 'type', 'onset_postoperative_day', 'clavien_dindo', 'observations', 'definition', 'definition_version', 'evaluations', 'pneumonia_nhsn_met', 'created_at', 'updated_at']);
    const episodeW = new CopyWriter(epClient, 'therapy_episodes', ['id', 'case_id', 'modality', 'start_postoperative_day', 'end_postoperative_day', 'prescribed_sessions_per_day', 'sessions_prescribed', 'sessions_delivered', 'session_minutes', 'interface', 'warnings', 'created_at', 'updated_at']);
    {
      for (let i = 0; i < N; i++) {
        let r = rnd() * wsum; let si = 0;
        while (r > weights[si] && si < weights.length - 1) { r -= weights[si]; si++; }
        const site = scenario[si];
        const siteId = siteOf.get(site.code)!;
        const surgery = new Date(start + Math.floor(rnd() * days) * 86400000);
        const year = surgery.getUTCFullYear();
        const key = `${site.code}:${year}`;
        // Above the demo cases' sequence numbers (the demo seed ran first).
        const seq = (seqs.get(key) ?? 500000) + 1; seqs.set(key, seq);
        let w = rnd() * TOTAL_WEIGHT; let ci = 0;
        while (w > CATEGORIES[ci].weight && ci < CATEGORIES.length - 1) { w -= CATEGORIES[ci].weight; ci++; }
        const cat = CATEGORIES[ci];
        const incision = cat.incision[Math.floor(rnd() * cat.incision.length)];
        const age = Math.min(99, Math.max(18, Math.round(62 + (rnd() + rnd() + rnd() - 1.5) * 30)));
        const spo2 = rnd() < 0.8 ? 96 + Math.floor(rnd() * 4) : rnd() < 0.8 ? 91 + Math.floor(rnd() * 5) : 86 + Math.floor(rnd() * 5);
        const hb = Math.round((13.2 + (rnd() + rnd() - 1) * 4) * 10) / 10;
        const infection = rnd() < 0.05;
        const emergency = rnd() < 0.14;
        const minutes = Math.max(20, Math.round(cat.minutes * (0.6 + rnd() * 0.9)));
        const score = ariscatScore({ age, preopSpO2: spo2, respiratoryInfectionLastMonth: infection, preopHemoglobin: Math.max(5, hb), incision: INCISION_SITE_TO_ARISCAT[incision], durationMinutes: minutes, emergency });
        const protocol = iso(surgery) >= site.protocolStart;
        const therapy = rnd() < (protocol ? 0.75 : 0.25) * (score.riskClass === 'low' ? 0.6 : 1);
        const risk = CLASS_RISK[score.riskClass] * (therapy ? 0.8 : 1.05);
        const ppc = rnd() < risk;
        const admit = addDays(surgery, -(rnd() < 0.8 ? 0 : 1 + Math.floor(rnd() * 3)));
        const stay = Math.max(1, Math.round((cat.minutes / 60) * (0.8 + rnd() * 1.6) + (ppc ? 3 + rnd() * 8 : 0)));
        const recent = surgery.getTime() > Date.UTC(2025, 10, 1);
        const discharged = !recent || rnd() < 0.6;
        const discharge = discharged ? addDays(surgery, stay) : null;
        const died = rnd() < (ppc ? 0.05 : 0.004);
        const s = rnd();
        const status = recent ? (s < 0.3 ? 'draft' : s < 0.7 ? 'complete' : 'verified') : s < 0.01 ? 'withdrawn' : s < 0.02 ? 'draft' : s < 0.06 ? 'complete' : s < 0.3 ? 'verified' : 'locked';
        const caseId = randomUUID();
        const creator = users.length ? users[Math.floor(rnd() * users.length)].id : null;
        const created = addDays(surgery, 1 + Math.floor(rnd() * 10));
        if (ppc) {
          const k = rnd() < 0.7 ? 1 : 2;
          for (let e = 0; e < k; e++) {
            const type = PPC_TYPES[Math.floor(rnd() * PPC_TYPES.length)];
            await eventW.write([randomUUID(), caseId, type, 1 + Math.floor(rnd() * 6), rnd() < 0.5 ? 'II' : 'IIIa', '[]', 'epco', '2015', '[]', type === 'respiratory-infection' && rnd() < 0.6, created.toISOString(), created.toISOString()]);
          }
        }
        if (rnd() < 0.01) await eventW.write([randomUUID(), caseId, rnd() < 0.5 ? 'reintubation' : 'ards', 2, 'IVa', '[]', 'epco', '2015', '[]', false, created.toISOString(), created.toISOString()]);
        if (therapy) {
          const k = rnd() < 0.7 ? 1 : 2;
          for (let e = 0; e < k; e++) {
            const prescribed = 3 * (1 + Math.floor(rnd() * 5));
            await episodeW.write([randomUUID(), caseId, MODALITIES[Math.floor(rnd() * MODALITIES.length)], Math.floor(rnd() * 3), 3 + Math.floor(rnd() * 4), 3, prescribed,
              Math.floor(prescribed * (0.3 + rnd() * 0.8)), 10, rnd() < 0.5 ? 'mouthpiece' : 'mask', '[]', created.toISOString(), created.toISOString()]);
          }
        }
        const height = Math.round(150 + rnd() * 40);
        await caseW.write([
          caseId, `SYN-${site.code}-${year}-${String(seq).padStart(7, '0')}`, year, seq, siteId, unitOf.get(`${siteId}:${cat.unit}`) ?? null, status, 1 + Math.floor(rnd() * 4), 'import',
          true, null, iso(admit), age, rnd() < 0.5 ? 'female' : 'male', height, Math.round(height - 100 + (rnd() - 0.3) * 30), ['I', 'II', 'III', 'IV'][Math.min(3, Math.floor(rnd() * 3.3 + (age > 70 ? 0.8 : 0)))],
          emergency, ['never', 'former', 'current'][Math.floor(rnd() * 3)], rnd() < 0.12, rnd() < 0.08, rnd() < 0.06, spo2, Math.max(5, hb), infection,
          rnd() < 0.85 ? 'independent' : 'partly-dependent', iso(surgery), cat.category, incision, rnd() < 0.55 ? 'open' : 'laparoscopic', emergency ? 'emergency' : 'elective',
          rnd() < 0.85 ? 'general' : 'regional', minutes, score.points, score.riskClass, therapy, true, discharge ? iso(discharge) : null, ppc && rnd() < 0.3 ? 1 + Math.floor(rnd() * 4) : 0,
          ppc && rnd() < 0.1 ? 1 : 0, rnd() < (ppc ? 0.18 : 0.06), null, died, died ? iso(addDays(surgery, 3 + Math.floor(rnd() * 20))) : null,
          discharged ? iso(addDays(surgery, 31)) : null, rnd() < 0.1 ? 'Synthetic benchmark case; note text of ordinary length for width.' : null,
          rnd().toString(16).slice(2).padEnd(64, '0'), false, '[]', creator, created.toISOString(), creator, created.toISOString(), '{}',
          status !== 'draft' ? created.toISOString() : null, status === 'verified' || status === 'locked' ? creator : null, status === 'verified' || status === 'locked' ? created.toISOString() : null,
          status === 'locked' ? creator : null, status === 'locked' ? created.toISOString() : null, status === 'withdrawn' ? creator : null, status === 'withdrawn' ? created.toISOString() : null,
          status === 'withdrawn' ? 'Duplicate of another synthetic case.' : null,
        ]);
        if (i > 0 && i % 200000 === 0) log(`  ${i.toLocaleString('en')} cases written (${((Date.now() - t0) / 1000).toFixed(0)} s) ...`);
      }
    }
    const [cases, ev, ep] = await Promise.all([caseW.end(), eventW.end(), episodeW.end()]);
    log(`  ${cases.toLocaleString('en')} cases copied (${((Date.now() - t0) / 1000).toFixed(0)} s)`);
    log(`  ${ev.toLocaleString('en')} outcome events and ${ep.toLocaleString('en')} therapy episodes copied (${((Date.now() - t0) / 1000).toFixed(0)} s)`);
    await client.query(`SET session_replication_role = origin`);
    await client.query(`SELECT analysis_rebuild()`);
    log(`  analysis tables rebuilt (${((Date.now() - t0) / 1000).toFixed(0)} s)`);
    for (const t of ['surgical_cases', 'outcome_events', 'therapy_episodes', 'analysis_case_facts', 'analysis_cells', 'analysis_los_cells']) await client.query(`VACUUM ANALYZE ${t}`);
    log(`  vacuumed and analysed (${((Date.now() - t0) / 1000).toFixed(0)} s)`);
    return { cases, events: ev, episodes: ep, seconds: (Date.now() - t0) / 1000 };
  } finally {
    await Promise.all([client.end(), evClient.end(), epClient.end()]);
  }
}
