/**
 * Demo cases: a FICTIONAL registry for the invented hospitals of scenario.ts. Every case,
 * episode and event is generated from a seeded PRNG (the same data on every machine); no real
 * patient stands behind any of it.
 *
 * About 10,000 cases from 2021-12 to 2026-11 across the four demo sites, in proportion to
 * their `size`, with realistic relations:
 * - ARISCAT inputs drawn so that the risk classes are about 60% low, 30% intermediate and 10%
 *   high (the target class is drawn first and inputs are resampled until they score in it);
 * - PPC risk by class 1.6% / 13.3% / 42.1% as reported for ARISCAT (Canet J et al.,
 *   Anesthesiology 2010;113:1338-50; see docs TRADE.md), scaled by 0.85 so that the overall rate
 *   is about 8% before the protocol and 5-6% after (published cohorts: 5-11%);
 * - pneumonia meeting CDC/NHSN PNU1 in about 1.5% of cases (Xiang B et al., Front Public
 *   Health 2022: about 1.5% in mixed surgery);
 * - a lung-expansion protocol from each site's `protocolStart`: therapy uptake rises and the
 *   PPC risk falls by about 30% (relative);
 * - outcome events carry observations consistent with the definitions, and the definitions
 *   are evaluated and stored exactly as the server does on a save;
 * - statuses: locked and verified in older months, complete and draft in the recent ones.
 * Inserted with multi-row INSERTs in one transaction (a few seconds).
 */
import { mulberry32 } from '../../../analysis/random/mulberry32.js';
import type { DataSource, EntityManager } from 'typeorm';
import type { Observation } from '../../../shared/clinical/observations.js';
import type { PpcEventType, ProcedureCategory, IncisionSite, TherapyModality } from '../../../shared/clinical/codes.js';
import type { CaseFields } from '../../../shared/registry/case.js';
import type { TherapyEpisodeFields } from '../../../shared/registry/therapy.js';
import { DEFAULT_THERAPY_CHECK_SETTINGS } from '../../../shared/clinical/modalities.js';
import { computeAriscat, caseWarnings } from '../../cases/case.rules.js';
import { formatRegistryNumber } from '../../cases/case.repo.js';
import { CASE_COLUMNS, THERAPY_COLUMNS } from '../../registry/columns.js';
import { identifierHash } from '../../registry/identifier-hash.js';
import { checkEpisode } from '../../therapy/therapy.rules.js';
import { evaluateEvent, normaliseObservations } from '../../outcomes/evaluate.js';
import { previousPneumonia } from '../../outcomes/outcomes.service.js';
import { SITES } from './scenario.js';
import { demoSeedSteps } from './steps.js';

// --- Seeded randomness ----------------------------------------------------------------------

/** Helpers over the one seeded generator (mulberry32, analysis/random). */
export function prng(seed: number) {
  const next = mulberry32(seed);
  const normal = (mean: number, sd: number) => mean + sd * Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next());
  return {
    next,
    chance: (p: number) => next() < p,
    int: (min: number, max: number) => min + Math.floor(next() * (max - min + 1)),
    normal,
    clamp: (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v)),
    pick: <T>(items: readonly T[]) => items[Math.floor(next() * items.length)],
    weighted: <T extends string>(w: Readonly<Record<T, number>>): T => {
      const entries = Object.entries(w) as [T, number][];
      let r = next() * entries.reduce((s, [, x]) => s + x, 0);
      for (const [k, x] of entries) if ((r -= x) < 0) return k;
      return entries[entries.length - 1][0];
    },
    poisson: (lambda: number) => {
      // Normal approximation is fine for the monthly volumes here (lambda > 10).
      return Math.max(0, Math.round(normal(lambda, Math.sqrt(lambda))));
    },
  };
}
type Rng = ReturnType<typeof prng>;

// --- Calendar --------------------------------------------------------------------------------

export const DEMO_FIRST_MONTH = '2021-12';
export const DEMO_LAST_MONTH = '2026-11';
const DAY = 86_400_000;
const toDay = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / DAY;
const iso = (day: number) => new Date(day * DAY).toISOString().slice(0, 10);
const addDays = (d: string, n: number) => iso(toDay(d) + n);
/** The day after the demo window: statuses are set as of this date. */
const DEMO_AS_OF = '2026-12-01';

function months(): string[] {
  const out: string[] = [];
  let [y, m] = DEMO_FIRST_MONTH.split('-').map(Number);
  for (;;) {
    const s = `${y}-${String(m).padStart(2, '0')}`;
    out.push(s);
    if (s === DEMO_LAST_MONTH) return out;
    m++;
    if (m === 13) { m = 1; y++; }
  }
}
const daysInMonth = (month: string) => new Date(Date.UTC(Number(month.slice(0, 4)), Number(month.slice(5, 7)), 0)).getUTCDate();

// --- Case mix --------------------------------------------------------------------------------

/** Cases per month at a site of size 1.0 (≈ 10,000 over 60 months for the four sites). */
const MONTHLY_AT_SIZE_1 = 75;

const MIX_GENERAL: Record<ProcedureCategory, number> = {
  'upper-gastrointestinal': 6, 'hepatobiliary-pancreatic': 6, colorectal: 13, 'abdominal-wall-hernia': 9, thoracic: 6, cardiac: 5, vascular: 6,
  orthopaedic: 20, spinal: 5, urological: 8, gynaecological: 7, 'head-and-neck': 3, neurosurgical: 2, 'breast-and-plastic': 3, other: 1,
};
/** The community hospital does no thoracic, cardiac or neurosurgery. */
const MIX_COMMUNITY: Record<ProcedureCategory, number> = { ...MIX_GENERAL, thoracic: 0, cardiac: 0, neurosurgical: 0, 'upper-gastrointestinal': 2, 'hepatobiliary-pancreatic': 1, orthopaedic: 32 };

const INCISIONS: Record<ProcedureCategory, Partial<Record<IncisionSite, number>>> = {
  'upper-gastrointestinal': { 'upper-abdominal': 8, 'thoraco-abdominal': 2 },
  'hepatobiliary-pancreatic': { 'upper-abdominal': 9, 'upper-and-lower-abdominal': 1 },
  colorectal: { 'lower-abdominal': 6, 'upper-and-lower-abdominal': 4 },
  'abdominal-wall-hernia': { 'lower-abdominal': 7, 'upper-abdominal': 3 },
  thoracic: { intrathoracic: 10 },
  cardiac: { intrathoracic: 10 },
  vascular: { peripheral: 6, 'lower-abdominal': 2, 'upper-and-lower-abdominal': 2 },
  orthopaedic: { peripheral: 10 },
  spinal: { spine: 10 },
  urological: { 'lower-abdominal': 7, peripheral: 3 },
  gynaecological: { 'lower-abdominal': 10 },
  'head-and-neck': { 'head-neck': 10 },
  neurosurgical: { intracranial: 10 },
  'breast-and-plastic': { 'chest-wall-breast': 6, peripheral: 4 },
  other: { peripheral: 5, 'lower-abdominal': 5 },
};
/** Median operating time (minutes) by category. */
const DURATION: Record<ProcedureCategory, number> = {
  'upper-gastrointestinal': 200, 'hepatobiliary-pancreatic': 210, colorectal: 170, 'abdominal-wall-hernia': 80, thoracic: 160, cardiac: 230, vascular: 150,
  orthopaedic: 95, spinal: 150, urological: 90, gynaecological: 100, 'head-and-neck': 130, neurosurgical: 180, 'breast-and-plastic': 90, other: 70,
};
const EMERGENCY: Record<ProcedureCategory, number> = {
  'upper-gastrointestinal': 0.15, 'hepatobiliary-pancreatic': 0.12, colorectal: 0.25, 'abdominal-wall-hernia': 0.15, thoracic: 0.05, cardiac: 0.08, vascular: 0.15,
  orthopaedic: 0.2, spinal: 0.06, urological: 0.06, gynaecological: 0.1, 'head-and-neck': 0.04, neurosurgical: 0.2, 'breast-and-plastic': 0.01, other: 0.1,
};

/** ARISCAT classes of the demo: about 60/30/10% (drawn first, then inputs scored into it). */
const CLASS_TARGET = { low: 60, intermediate: 30, high: 10 } as const;
/** Reported PPC risk by ARISCAT class (Canet 2010; TRADE.md), scaled. */
const PPC_RISK = { low: 0.016, intermediate: 0.133, high: 0.421 } as const;
const PPC_SCALE = 0.85;
/** The protocol's effect: about 30% lower PPC risk (relative). */
const PROTOCOL_RR = 0.7;

interface Draft {
  fields: CaseFields;
  ariscat: { points: number; riskClass: 'low' | 'intermediate' | 'high' } | null;
}

function drawPatientAndOperation(r: Rng, mix: Record<ProcedureCategory, number>, surgeryDate: string, afterProtocol: boolean): Draft {
  const target = r.weighted(CLASS_TARGET);
  let last: Draft | null = null;
  for (let attempt = 0; attempt < 60; attempt++) {
    const category = r.weighted(mix);
    const incisionSite = r.weighted(INCISIONS[category] as Record<IncisionSite, number>);
    const sex = r.chance(0.5) ? 'female' : 'male';
    const age = Math.round(r.clamp(r.normal(target === 'low' ? 57 : 66, 15), 18, 96));
    const heightCm = Math.round(r.clamp(sex === 'male' ? r.normal(176, 7) : r.normal(163, 6.5), 140, 205) * 10) / 10;
    const weightKg = Math.round(r.clamp(r.normal(27, 5), 16, 50) * (heightCm / 100) ** 2 * 10) / 10;
    const smokingStatus = r.weighted({ never: 50, former: 32, current: 18 });
    const copd = r.chance(smokingStatus === 'never' ? 0.04 : 0.16);
    const heartFailure = r.chance(age > 70 ? 0.09 : 0.03);
    const obstructiveSleepApnoea = r.chance(weightKg / (heightCm / 100) ** 2 > 32 ? 0.2 : 0.05);
    const spo2Roll = r.next();
    const preopSpO2 = spo2Roll < (copd ? 0.12 : 0.03) ? r.int(86, 90) : spo2Roll < (copd ? 0.45 : 0.15) ? r.int(91, 95) : r.int(96, 99);
    const respiratoryInfectionLastMonth = r.chance(0.06);
    const hb = Math.round(r.clamp(r.normal(sex === 'male' ? 13.6 : 12.6, 1.6), 6.5, 17.5) * 10) / 10;
    const emergency = r.chance(EMERGENCY[category]);
    const durationMinutes = Math.round(r.clamp(DURATION[category] * Math.exp(r.normal(0, 0.35)), 20, 720));
    const asaClass = r.weighted(age > 75 || copd || heartFailure ? { I: 2, II: 35, III: 50, IV: 11, V: 2 } : { I: 22, II: 50, III: 25, IV: 3, V: 0 });
    const d: CaseFields = {
      eligible: true, age, sex, heightCm, weightKg, asaClass, asaEmergency: emergency ? r.chance(0.95) : r.chance(0.01), smokingStatus, copd, obstructiveSleepApnoea, heartFailure,
      preopSpO2, preopHaemoglobin: r.chance(0.3) ? { value: Math.round(hb * 10), unit: 'g/L' } : { value: hb, unit: 'g/dL' }, respiratoryInfectionLastMonth,
      functionalStatus: r.weighted({ independent: 85, 'partly-dependent': 12, 'fully-dependent': 3 }),
      surgeryDate, procedureCategory: category, incisionSite,
      approach: ['orthopaedic', 'spinal', 'head-and-neck', 'neurosurgical', 'breast-and-plastic', 'cardiac'].includes(category) ? 'open'
        : r.weighted({ open: afterProtocol ? 40 : 50, laparoscopic: 45, robotic: afterProtocol ? 15 : 5 }),
      urgency: emergency ? 'emergency' : 'elective',
      anaesthesia: ['orthopaedic', 'urological'].includes(category) && r.chance(0.45) ? 'regional' : 'general',
      durationMinutes,
    };
    const ariscat = computeAriscat(d);
    last = { fields: d, ariscat };
    if (ariscat?.riskClass === target) return last;
  }
  return last!;
}

// --- Outcomes: observations consistent with the definitions ------------------------------------

const PPC_TYPES: Record<Exclude<PpcEventType, 'reintubation' | 'ards'>, number> = {
  'respiratory-failure': 30, atelectasis: 25, 'respiratory-infection': 22, 'pleural-effusion': 12, bronchospasm: 6, pneumothorax: 3, 'aspiration-pneumonitis': 2,
};

let obsSeq = 0;
const oid = () => `o${++obsSeq}`;

function temperature(r: Rng, c: number): Observation {
  return r.chance(0.25)
    ? { id: oid(), kind: 'temperature-max', value: Math.round(((c * 9) / 5 + 32) * 10) / 10, unit: 'degF' } as Observation
    : { id: oid(), kind: 'temperature-max', value: Math.round(c * 10) / 10, unit: 'degC' } as Observation;
}

/** Observations of one event (post-operative days), and the Clavien–Dindo grade. */
function eventEvidence(r: Rng, type: PpcEventType, day: number, meetsPnu1: boolean, thoracic: boolean): { observations: Observation[]; grade: string } {
  const at = (o: Observation, d = day) => ({ ...o, postoperativeDay: d }) as Observation;
  switch (type) {
    case 'respiratory-infection': {
      if (meetsPnu1) {
        return {
          grade: r.weighted({ II: 75, IIIa: 8, IVa: 15, V: 2 }),
          observations: [
            at({ id: oid(), kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'consolidation', course: 'new' }] } as Observation),
            at({ id: oid(), kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'consolidation', course: 'persistent' }] } as Observation, day + 2),
            at(temperature(r, 38.3 + r.next() * 1.2)),
            at(r.chance(0.3) ? ({ id: oid(), kind: 'wbc', which: 'highest', value: Math.round(12.5 + r.next() * 8) , unit: '10^9/L' } as Observation) : ({ id: oid(), kind: 'wbc', which: 'highest', value: 12500 + r.int(0, 8000), unit: 'per-mm3' } as Observation)),
            at({ id: oid(), kind: 'sputum', newPurulent: true, changedCharacter: true, increasedSecretionsOrSuctioning: r.chance(0.5), colour: r.pick(['yellow', 'green'] as const) } as Observation),
            at({ id: oid(), kind: 'respiratory-sign', sign: 'cough', onset: 'new' } as Observation),
            at({ id: oid(), kind: 'auscultation', finding: 'rales', newSinceBaseline: true } as Observation),
            at({ id: oid(), kind: 'antibiotics-started', indication: 'suspected-respiratory-infection' } as Observation),
            at({ id: oid(), kind: 'physician-diagnosis', diagnosis: 'respiratory-infection' } as Observation),
          ],
        };
      }
      // A treated chest infection without serial imaging: EPCO's respiratory infection, not PNU1.
      return {
        grade: 'II',
        observations: [
          at({ id: oid(), kind: 'antibiotics-started', indication: 'suspected-respiratory-infection' } as Observation),
          at({ id: oid(), kind: 'sputum', newPurulent: true, changedCharacter: true, increasedSecretionsOrSuctioning: false, colour: 'yellow' } as Observation),
          at(temperature(r, 37.6 + r.next() * 0.6)),
        ],
      };
    }
    case 'atelectasis':
      return {
        grade: r.weighted({ I: 55, II: 40, IIIa: 5 }),
        observations: [
          at({ id: oid(), kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'collapse-with-shift', course: 'new' }], definitive: true } as Observation),
          at({ id: oid(), kind: 'spo2', percent: r.int(89, 93), breathing: 'room-air' } as Observation),
        ],
      };
    case 'respiratory-failure': {
      const kpa = r.chance(0.4);
      const mmHg = 48 + r.int(0, 10);
      return {
        grade: r.weighted({ II: 55, IIIa: 10, IVa: 30, IVb: 5 }),
        observations: [
          at(kpa ? ({ id: oid(), kind: 'pao2', value: Math.round((mmHg / 7.50062) * 10) / 10, unit: 'kPa', breathing: 'room-air' } as Observation) : ({ id: oid(), kind: 'pao2', value: mmHg, unit: 'mmHg', breathing: 'room-air' } as Observation)),
          at({ id: oid(), kind: 'spo2', percent: r.int(84, 89), breathing: 'room-air' } as Observation),
          at({ id: oid(), kind: 'supplemental-oxygen', change: 'started' } as Observation),
        ],
      };
    }
    case 'pleural-effusion':
      return { grade: r.weighted({ I: 60, II: 25, IIIa: 15 }), observations: [at({ id: oid(), kind: 'chest-imaging', modality: r.chance(0.7) ? 'radiograph' : 'ultrasound', findings: [{ type: 'effusion', course: 'new' }] } as Observation)] };
    case 'pneumothorax':
      return { grade: thoracic ? r.weighted({ I: 40, IIIa: 55, IIIb: 5 }) : r.weighted({ IIIa: 80, IIIb: 20 }), observations: [at({ id: oid(), kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'pneumothorax', course: 'new' }] } as Observation)] };
    case 'bronchospasm':
      return {
        grade: 'II',
        observations: [at({ id: oid(), kind: 'auscultation', finding: 'wheeze', newSinceBaseline: true } as Observation), at({ id: oid(), kind: 'bronchodilator-given' } as Observation)],
      };
    case 'aspiration-pneumonitis':
      return {
        grade: r.weighted({ II: 60, IVa: 40 }),
        observations: [
          at({ id: oid(), kind: 'aspiration', evidence: 'witnessed' } as Observation),
          at({ id: oid(), kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'infiltrate', course: 'new' }] } as Observation, day + 1),
          at({ id: oid(), kind: 'pf-ratio', value: 180 + r.int(0, 100), unit: 'mmHg' } as Observation, day + 1),
        ],
      };
    case 'reintubation':
      return { grade: 'IVa', observations: [at({ id: oid(), kind: 'supplemental-oxygen', change: 'ventilator-demand-increased' } as Observation), at({ id: oid(), kind: 'physician-diagnosis', diagnosis: 'reintubation' } as Observation)] };
    case 'ards':
      return {
        grade: r.weighted({ IVa: 50, IVb: 35, V: 15 }),
        observations: [
          at({ id: oid(), kind: 'chest-imaging', modality: 'radiograph', findings: [{ type: 'infiltrate', course: 'new' }] } as Observation),
          at({ id: oid(), kind: 'pf-ratio', value: 90 + r.int(0, 100), unit: 'mmHg' } as Observation),
          at({ id: oid(), kind: 'physician-diagnosis', diagnosis: 'ards' } as Observation),
        ],
      };
  }
}

// --- Therapy ---------------------------------------------------------------------------------

function drawEpisodes(r: Rng, c: CaseFields, stay: number, afterProtocol: boolean, riskClass: string | undefined): TherapyEpisodeFields[] {
  const atRisk = riskClass === 'intermediate' || riskClass === 'high';
  const uptake = afterProtocol ? (atRisk ? 0.92 : 0.62) : atRisk ? 0.5 : 0.18;
  if (!r.chance(uptake)) return [];
  const modalities: TherapyModality[] = [afterProtocol || r.chance(0.7) ? 'incentive-spirometry' : 'chest-physiotherapy'];
  if (afterProtocol && atRisk && r.chance(0.35)) modalities.push(r.weighted({ pep: 50, 'pap-device': 35, cpap: 15 }));
  if (afterProtocol ? r.chance(0.8) : r.chance(0.3)) modalities.push('early-mobilisation');
  if (!afterProtocol && r.chance(0.1)) modalities.push('ippb');
  return modalities.map((modality) => {
    const start = afterProtocol ? r.weighted({ 0: 55, 1: 40, 2: 5 }) : r.weighted({ 0: 10, 1: 45, 2: 35, 3: 10 });
    const days = Math.max(1, Math.min(stay - Number(start) + 1, r.int(2, 5)));
    const perDay = modality === 'early-mobilisation' ? r.int(2, 3) : modality === 'incentive-spirometry' ? r.int(4, 8) : r.int(2, 4);
    const prescribed = perDay * days;
    const adherence = r.clamp(r.normal(afterProtocol ? 0.85 : 0.65, 0.15), 0.2, 1);
    const e: TherapyEpisodeFields = {
      modality, startPostoperativeDay: Number(start), endPostoperativeDay: Number(start) + days - 1, prescribedSessionsPerDay: perDay,
      sessionsPrescribed: prescribed, sessionsDelivered: Math.round(prescribed * adherence),
      sessionMinutes: modality === 'early-mobilisation' ? r.int(10, 30) : r.int(8, 20),
      tolerance: r.weighted({ good: 75, fair: 20, poor: 5 }), adverseEvents: r.chance(0.95) ? ['none'] : [r.pick(['dizziness-or-hyperventilation', 'discomfort-or-pain', 'fatigue'] as const)],
      stopReason: r.weighted({ 'course-completed': 55, discharged: 40, 'no-longer-indicated': 5 }),
    };
    if (modality === 'incentive-spirometry') {
      Object.assign(e, { interface: 'mouthpiece', noseClip: r.chance(0.2), volumeTargetMl: 250 * r.int(4, 10) });
      if (r.chance(0.3)) e.inspiratoryCapacityMl = 50 * Math.round(r.clamp(r.normal(1500, 500), 400, 3500) / 50);
    } else if (modality === 'pep') {
      Object.assign(e, { interface: r.pick(['mouthpiece', 'mask'] as const), noseClip: false, aerosolMedication: r.chance(0.2), expiratoryPressureCmH2O: r.int(10, 20) });
    } else if (modality === 'pap-device') {
      Object.assign(e, { interface: r.pick(['mouthpiece', 'mask'] as const), noseClip: false, aerosolMedication: r.chance(0.2), sourceGas: r.pick(['air', 'oxygen'] as const), flowLpm: r.chance(0.7) ? 5 : r.int(4, 10), expiratoryPressureCmH2O: r.int(5, 20) });
    } else if (modality === 'cpap') {
      Object.assign(e, { interface: 'mask', aerosolMedication: false, sourceGas: r.pick(['air', 'oxygen'] as const), flowLpm: r.int(8, 15), expiratoryPressureCmH2O: r.int(5, 12) });
    } else if (modality === 'ippb') {
      Object.assign(e, { interface: 'mouthpiece', noseClip: true, aerosolMedication: r.chance(0.5), sourceGas: r.pick(['air', 'oxygen'] as const), flowLpm: r.int(6, 12) });
    }
    // One in a hundred sessions recorded as unusually long (a warning, with the caution).
    if (modality !== 'early-mobilisation' && r.chance(0.01)) e.sessionMinutes = 75;
    void c;
    return e;
  });
}

// --- Status and people -----------------------------------------------------------------------

function monthsBefore(month: string, asOf: string): number {
  const [y, m] = month.split('-').map(Number);
  const [ay, am] = asOf.split('-').map(Number);
  return (ay - y) * 12 + (am - m);
}

interface People { abstractors: string[]; verifiers: string[] }

// --- Insert helpers --------------------------------------------------------------------------

async function insertRows(tx: EntityManager, table: string, columns: string[], rows: unknown[][]): Promise<string[]> {
  const ids: string[] = [];
  const per = Math.max(1, Math.floor(60_000 / columns.length));
  for (let i = 0; i < rows.length; i += per) {
    const chunk = rows.slice(i, i + per);
    const params: unknown[] = [];
    const values = chunk.map((row) => `(${row.map((v) => { params.push(v); return `$${params.length}`; }).join(', ')})`);
    const out = await tx.query(`INSERT INTO ${table} (${columns.map((c) => `"${c}"`).join(', ')}) VALUES ${values.join(', ')} RETURNING id`, params);
    ids.push(...out.map((o: { id: string }) => o.id));
  }
  return ids;
}

const EXCLUSIONS = ['Day-case procedure', 'Transferred in after post-operative day 0', 'Ventilated before surgery'];

/** Generates and inserts the demo cases; returns counts. */
export async function seedDemoCases(ds: DataSource, opts: { seed?: number; scale?: number; hashSecret?: string } = {}): Promise<{ cases: number; episodes: number; events: number }> {
  const r = prng(opts.seed ?? 20211201);
  obsSeq = 0;
  const scale = opts.scale ?? 1;
  const sites: { id: string; code: string }[] = await ds.query(`SELECT id, code FROM sites`);
  const units: { id: string; site_id: string; code: string }[] = await ds.query(`SELECT id, site_id, code FROM units`);
  const users: { id: string; email: string; roles: string[] }[] = await ds.query(`SELECT id, email, roles FROM users`);
  const byEmail = (e: string) => users.find((u) => u.email === e)?.id;
  const admin = byEmail('admin@tidewater.example') ?? null;
  const analyst = byEmail('analyst@tidewater.example') ?? admin;
  const ab1 = byEmail('abstractor@tidewater.example') ?? admin;
  const ab2 = byEmail('abstractor2@tidewater.example') ?? admin;
  const people = (code: string): People => (['HBR', 'KSV'].includes(code) ? { abstractors: [ab1!, ab2!].filter(Boolean), verifiers: [ab1!, ab2!, analyst!].filter(Boolean) } : { abstractors: [admin!].filter(Boolean), verifiers: [analyst!].filter(Boolean) });
  const secret = opts.hashSecret ?? process.env.IDENTIFIER_HASH_SECRET;

  const caseCols = ['registry_number', 'registry_year', 'registry_seq', 'site_id', 'unit_id', 'status', 'version', 'created_via', ...Object.values(CASE_COLUMNS).map((c) => c.column).filter((c) => c !== 'unit_id'),
    'ariscat_points', 'ariscat_class', 'identifier_hash', 'warnings', 'created_by', 'created_at', 'updated_by', 'updated_at', 'editors_since_verification', 'completed_at', 'verified_by', 'verified_at', 'locked_by', 'locked_at', 'withdrawn_by', 'withdrawn_at', 'withdrawn_reason'];
  const caseRows: unknown[][] = [];
  type Pending = { episodes: TherapyEpisodeFields[]; events: { type: PpcEventType; day: number; evidence: { observations: Observation[]; grade: string } }[]; fields: CaseFields; createdAt: string; by: string | null };
  const pending: Pending[] = [];

  for (const site of SITES) {
    const row = sites.find((s) => s.code === site.code);
    if (!row) continue;
    const siteUnits = units.filter((u) => u.site_id === row.id);
    const unitId = (code: string) => siteUnits.find((u) => u.code === code)?.id ?? null;
    const who = people(site.code);
    const mix = site.code === 'CLF' ? MIX_COMMUNITY : MIX_GENERAL;
    const seqByYear = new Map<number, number>();
    const patients: { hash: string }[] = [];
    for (const month of months()) {
      const seasonal = 1 + 0.08 * Math.cos(((Number(month.slice(5, 7)) - 1) / 12) * 2 * Math.PI);
      const n = r.poisson(MONTHLY_AT_SIZE_1 * site.size * seasonal * scale);
      const dates = Array.from({ length: n }, () => `${month}-${String(r.int(1, daysInMonth(month))).padStart(2, '0')}`).sort();
      const age = monthsBefore(month, DEMO_AS_OF);
      for (const surgeryDate of dates) {
        const after = surgeryDate >= site.protocolStart;
        const { fields: f, ariscat } = drawPatientAndOperation(r, mix, surgeryDate, after);
        const emergency = f.urgency === 'emergency';
        f.admissionDate = addDays(surgeryDate, -(emergency ? r.int(0, 2) : r.weighted({ 0: 70, 1: 28, 2: 2 }) as unknown as number) * 1);
        // Outcomes
        const cls = ariscat?.riskClass ?? 'low';
        const pPpc = PPC_RISK[cls] * PPC_SCALE * (after ? PROTOCOL_RR : 1);
        const events: Pending['events'] = [];
        if (r.chance(pPpc)) {
          const first = r.weighted(f.procedureCategory === 'thoracic' ? { ...PPC_TYPES, pneumothorax: 15, 'pleural-effusion': 20 } : PPC_TYPES) as PpcEventType;
          const types = new Set<PpcEventType>([first]);
          if (r.chance(0.25)) types.add(r.weighted(PPC_TYPES) as PpcEventType);
          if (r.chance(0.08)) types.add('reintubation');
          if (r.chance(0.03)) types.add('ards');
          for (const t of types) {
            const day = r.weighted({ 1: 25, 2: 30, 3: 20, 4: 12, 5: 8, 6: 5 }) as unknown as number;
            // About 80% of treated chest infections meet PNU1 (serial imaging and the signs).
            const meets = t === 'respiratory-infection' && r.chance(0.8);
            events.push({ type: t, day: Number(day), evidence: eventEvidence(r, t, Number(day), meets, f.procedureCategory === 'thoracic') });
          }
        } else if (r.chance(0.004)) {
          events.push({ type: 'reintubation', day: 1, evidence: eventEvidence(r, 'reintubation', 1, false, false) });
        }
        const hadPpc = events.length > 0;
        const severe = events.some((e) => ['IVa', 'IVb', 'V'].includes(e.evidence.grade));
        // Stay, ICU, ventilation, follow-up
        const baseStay = Math.round(r.clamp(Math.exp(r.normal(Math.log(['orthopaedic', 'abdominal-wall-hernia', 'breast-and-plastic', 'urological', 'gynaecological'].includes(f.procedureCategory!) ? 2.5 : 5), 0.45)), 1, 40));
        const stay = baseStay + (hadPpc ? r.int(3, 10) : 0) + (severe ? r.int(3, 8) : 0);
        f.icuDays = f.procedureCategory === 'cardiac' ? r.int(1, 3) + (severe ? r.int(2, 6) : 0) : severe ? r.int(1, 6) : cls === 'high' && r.chance(0.25) ? r.int(1, 2) : 0;
        f.icuDays = Math.min(f.icuDays, stay);
        f.ventilatorDays = severe ? Math.min(f.icuDays, r.int(1, 5)) : f.procedureCategory === 'cardiac' && r.chance(0.3) ? 1 : 0;
        const diedP = severe ? 0.2 : hadPpc ? 0.03 : 0.004;
        f.died30d = r.chance(diedP);
        if (f.died30d) {
          const deathDay = Math.min(30, r.int(Math.min(stay, 30) > 2 ? 2 : 1, Math.min(30, stay + 10)));
          f.deathDate = addDays(surgeryDate, deathDay);
          f.dischargeDate = deathDay <= stay ? f.deathDate : addDays(surgeryDate, stay);
        } else {
          f.deathDate = null;
          f.dischargeDate = addDays(surgeryDate, stay);
        }
        f.readmitted30d = !f.died30d && r.chance(hadPpc ? 0.14 : 0.06);
        f.readmissionCause = f.readmitted30d ? (r.chance(hadPpc ? 0.5 : 0.2) ? 'respiratory' : 'other') : null;
        const windowEnd = addDays(surgeryDate, 30);
        f.followUpCompletedOn = windowEnd < DEMO_AS_OF ? (f.died30d && r.chance(0.5) ? addDays(f.deathDate!, r.int(0, 3)) : addDays(windowEnd, r.int(0, 12))) : null;
        if (f.followUpCompletedOn && f.followUpCompletedOn >= DEMO_AS_OF) f.followUpCompletedOn = null;
        f.unitId = f.icuDays && f.icuDays > 0 && r.chance(0.5) ? unitId('ICU') : ['orthopaedic', 'spinal'].includes(f.procedureCategory!) ? unitId('ORTHO') : unitId(r.chance(0.5) ? 'SURG-A' : 'SURG-B');
        f.complicationsReviewed = true;
        f.notes = null;
        // Eligibility: a few cases fall outside the surveillance population.
        if (r.chance(0.02)) { f.eligible = false; f.exclusionReason = r.pick(EXCLUSIONS); } else f.exclusionReason = null;
        // Therapy
        const episodes = drawEpisodes(r, f, stay, after, ariscat?.riskClass);
        f.therapyGiven = episodes.length > 0;
        // Status by the age of the month (and whether follow-up is done).
        let status: 'draft' | 'complete' | 'verified' | 'locked' | 'withdrawn';
        if (!f.followUpCompletedOn) status = 'draft';
        else if (age >= 4) status = r.weighted({ locked: 88, verified: 10, complete: 1.5, withdrawn: 0.5 });
        else if (age >= 2) status = r.weighted({ verified: 60, complete: 30, draft: 9, withdrawn: 1 });
        else status = r.weighted({ complete: 55, draft: 45 });
        // Drafts often miss a field or two (what the worklist shows).
        if (status === 'draft' && r.chance(0.5)) {
          const miss = r.pick(['preopHaemoglobin', 'preopSpO2', 'heightCm', 'functionalStatus', 'durationMinutes'] as const);
          (f as Record<string, unknown>)[miss] = null;
          f.complicationsReviewed = r.chance(0.5) ? true : null;
        }
        const ariscatFinal = computeAriscat(f);
        const year = Number(surgeryDate.slice(0, 4));
        const seq = (seqByYear.get(year) ?? 0) + 1;
        seqByYear.set(year, seq);
        const by = r.pick(who.abstractors) ?? null;
        const verifier = who.verifiers.find((v) => v !== by) ?? null;
        const createdAt = `${addDays(surgeryDate, r.int(1, 5))}T10:00:00Z`;
        const completedAt = status !== 'draft' ? `${addDays(f.followUpCompletedOn ?? surgeryDate, r.int(0, 5))}T12:00:00Z` : null;
        const verifiedAt = status === 'verified' || status === 'locked' || (status === 'withdrawn' && age >= 4) ? `${addDays(completedAt!.slice(0, 10), r.int(1, 10))}T14:00:00Z` : null;
        const lockedAt = status === 'locked' ? `${addDays(`${month}-01`, daysInMonth(month) + 45)}T09:00:00Z` : null;
        const clampTs = (t: string | null) => (t && t.slice(0, 10) >= DEMO_AS_OF ? `${addDays(DEMO_AS_OF, -1)}T18:00:00Z` : t);
        // Keyed hash of a fictional hospital identifier for most cases; a few patients come back.
        let hash: string | null = null;
        if (secret && r.chance(0.7)) {
          if (patients.length > 50 && r.chance(0.03)) hash = r.pick(patients).hash;
          else {
            hash = identifierHash(secret, row.id, `DEMO-${site.code}-${String(r.int(100000, 999999))}`);
            patients.push({ hash });
          }
        }
        const storedWarnings = caseWarnings(f);
        const fieldValues = Object.entries(CASE_COLUMNS).filter(([, c]) => c.column !== 'unit_id').map(([name]) => {
          const v = (f as Record<string, unknown>)[name];
          if (name === 'preopHaemoglobin') return v == null ? null : (v as { unit: string; value: number }).unit === 'g/L' ? (v as { value: number }).value / 10 : (v as { value: number }).value;
          return v ?? null;
        });
        caseRows.push([
          formatRegistryNumber(site.code, year, seq), year, seq, row.id, f.unitId ?? null, status, 1, 'form', ...fieldValues,
          ariscatFinal?.points ?? null, ariscatFinal?.riskClass ?? null, hash, JSON.stringify(storedWarnings), by, createdAt, by, clampTs(lockedAt ?? verifiedAt ?? completedAt ?? createdAt),
          status === 'complete' ? [by].filter(Boolean) : [], clampTs(completedAt), verifiedAt ? verifier : null, clampTs(verifiedAt), lockedAt ? admin : null, clampTs(lockedAt),
          status === 'withdrawn' ? admin : null, status === 'withdrawn' ? clampTs(`${addDays(surgeryDate, 40)}T09:00:00Z`) : null, status === 'withdrawn' ? 'Entered for the wrong hospital stay (demo)' : null,
        ]);
        pending.push({ episodes, events, fields: f, createdAt, by });
      }
    }
  }

  let episodeCount = 0;
  let eventCount = 0;
  await ds.transaction(async (tx) => {
    // Bulk load: the analysis roll-up triggers are suspended and rebuilt once at the end.
    await tx.query(`SELECT set_config('alveolog.analysis_bulk', 'on', true)`);
    const ids = await insertRows(tx, 'surgical_cases', caseCols, caseRows);
    const epCols = ['case_id', 'created_by', 'created_at', 'updated_at', 'warnings', ...Object.values(THERAPY_COLUMNS).map((c) => c.column)];
    const epRows: unknown[][] = [];
    const evCols = ['case_id', 'type', 'onset_postoperative_day', 'clavien_dindo', 'clavien_dindo_disability', 'observations', 'definition', 'definition_version', 'evaluations', 'pneumonia_nhsn_met', 'created_by', 'created_at', 'updated_at'];
    const evRows: unknown[][] = [];
    pending.forEach((p, i) => {
      for (const e of p.episodes) {
        const checked = checkEpisode(e, p.fields, DEFAULT_THERAPY_CHECK_SETTINGS);
        if (checked.errors.length) throw new Error(`demo therapy episode is not valid: ${JSON.stringify(checked.errors)}`);
        epRows.push([ids[i], p.by, p.createdAt, p.createdAt, JSON.stringify(checked.warnings), ...Object.keys(THERAPY_COLUMNS).map((k) => (checked.fields as Record<string, unknown>)[k] ?? null)]);
      }
      const stored: { evaluations: unknown[] }[] = [];
      for (const ev of p.events) {
        // Stored in one unit per quantity, as the server stores a save (shared/clinical/units.ts).
        const observations = normaliseObservations(ev.evidence.observations);
        const result = evaluateEvent({ type: ev.type, observations }, { admissionDate: p.fields.admissionDate, surgeryDate: p.fields.surgeryDate!, age: p.fields.age, copd: p.fields.copd, heartFailure: p.fields.heartFailure }, { at: p.createdAt, previousPneumoniaDateOfEvent: previousPneumonia(stored, null) });
        stored.push({ evaluations: result.evaluations });
        evRows.push([ids[i], ev.type, ev.day, ev.evidence.grade, false, JSON.stringify(observations), result.definition, result.definitionVersion, JSON.stringify(result.evaluations), result.pneumoniaNhsnMet, p.by, p.createdAt, p.createdAt]);
      }
    });
    await insertRows(tx, 'therapy_episodes', epCols, epRows);
    await insertRows(tx, 'outcome_events', evCols, evRows);
    episodeCount = epRows.length;
    eventCount = evRows.length;
    const [{ exists }] = await tx.query(`SELECT EXISTS (SELECT 1 FROM pg_proc WHERE proname = 'analysis_rebuild') AS exists`);
    await tx.query(`SELECT set_config('alveolog.analysis_bulk', 'off', true)`);
    if (exists) await tx.query(`SELECT analysis_rebuild()`);
  });
  // Fresh statistics: the case list's planner estimate and the plans depend on them.
  await ds.query(`ANALYZE surgical_cases, therapy_episodes, outcome_events`);
  return { cases: caseRows.length, episodes: episodeCount, events: eventCount };
}

demoSeedSteps.push({
  name: 'cases (fictional)',
  run: async (ds, log) => {
    const n = await seedDemoCases(ds);
    log(`demo cases: ${n.cases} cases, ${n.episodes} therapy episodes, ${n.events} outcome events (all fictional)`);
  },
});
