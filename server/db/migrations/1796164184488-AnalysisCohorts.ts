import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Saved cohorts, and the analysis tables the database keeps for itself (server/analysis/facts.ts
 * explains them): the narrow fact table `analysis_case_facts` (one row per case, kept by
 * triggers on cases, therapy episodes and outcome events) and its roll-ups `analysis_cells` and
 * `analysis_los_cells` (kept by a trigger on the fact table). `analysis_rebuild()` recomputes
 * all three set-wise (bulk loads set `alveolog.analysis_bulk` to skip the row triggers first).
 *
 * The code lists below are frozen copies of server/analysis/facts.ts: append only.
 */
const STATUS = `ARRAY['draft','complete','verified','locked','withdrawn']::text[]`;
const CATEGORY = `ARRAY['upper-gastrointestinal','hepatobiliary-pancreatic','colorectal','abdominal-wall-hernia','thoracic','cardiac','vascular','orthopaedic','spinal','urological','gynaecological','head-and-neck','neurosurgical','breast-and-plastic','other']::text[]`;
const INCISION = `ARRAY['peripheral','head-neck','intracranial','spine','chest-wall-breast','lower-abdominal','upper-abdominal','upper-and-lower-abdominal','intrathoracic','thoraco-abdominal']::text[]`;
const APPROACH = `ARRAY['open','laparoscopic','robotic']::text[]`;
const URGENCY = `ARRAY['elective','emergency']::text[]`;
const ASA = `ARRAY['I','II','III','IV','V','VI']::text[]`;
const ARISCAT = `ARRAY['low','intermediate','high']::text[]`;
const SEX = `ARRAY['female','male']::text[]`;
const MODALITY = `ARRAY['incentive-spirometry','pep','pap-device','cpap','ippb','chest-physiotherapy','early-mobilisation']::text[]`;
const EVENT = `ARRAY['atelectasis','respiratory-infection','respiratory-failure','reintubation','bronchospasm','aspiration-pneumonitis','pleural-effusion','pneumothorax','ards']::text[]`;
/** Bits 0,1,2,4,5,6,7 of EVENT: the any-PPC composite (reintubation and ARDS outside it). */
const ANY_PPC_MASK = 247;

const CELL_KEY = 'site_id, month, status, ariscat, incision, therapy';
const CELL_MEASURES = ['n', 'any_ppc', 'atelectasis', 'pneumonia', 'respiratory_infection', 'respiratory_failure', 'reintubation', 'ards', 'readmitted', 'died', 'discharged', 'patient_days', 'pneumonia_discharged'];
/** The measure expressions of one fact row `f`, in CELL_MEASURES order. */
const FACT_MEASURES = [
  '1',
  `(f.event_types & ${ANY_PPC_MASK} <> 0)::int`,
  '(f.event_types & 1 <> 0)::int',
  'f.pneumonia::int',
  '(f.event_types & 2 <> 0)::int',
  '(f.event_types & 4 <> 0)::int',
  '(f.event_types & 8 <> 0)::int',
  '(f.event_types & 256 <> 0)::int',
  'f.readmitted::int',
  'f.died::int',
  '(f.patient_days IS NOT NULL)::int',
  'coalesce(f.patient_days, 0)::int',
  '(f.pneumonia AND f.patient_days IS NOT NULL)::int',
];
const FACT_KEY = 'f.site_id, f.month, f.status, coalesce(f.ariscat, 0)::smallint, coalesce(f.incision, 0)::smallint, f.therapy';

export class AnalysisCohorts1796164184488 implements MigrationInterface {
  name = 'AnalysisCohorts1796164184488';

  public async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "saved_cohorts" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "name" text NOT NULL, "description" text, "filter" jsonb NOT NULL, "owner_id" uuid NOT NULL, "shared" boolean NOT NULL DEFAULT false, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_768359237ffcf70ab40b8351ae4" PRIMARY KEY ("id"))`);
    await q.query(`CREATE INDEX "IDX_345f7a2a44398abd71b4e4e5b9" ON "saved_cohorts"  ("shared") `);
    await q.query(`CREATE UNIQUE INDEX "IDX_8863c474023bcc2927aac2fa88" ON "saved_cohorts"  ("owner_id", "name") `);

    // Narrow fact table: widest columns first for alignment; no foreign keys (the triggers keep it).
    await q.query(`CREATE TABLE analysis_case_facts (
      case_id uuid PRIMARY KEY, site_id uuid NOT NULL, unit_id uuid,
      event_types integer NOT NULL, modalities integer NOT NULL, surgery_date date NOT NULL, month date NOT NULL, adherence real,
      status smallint NOT NULL, category smallint, incision smallint, approach smallint, urgency smallint, asa smallint,
      ariscat smallint, age smallint, sex smallint, first_therapy_day smallint, los smallint, patient_days smallint,
      therapy boolean NOT NULL, pneumonia boolean NOT NULL, readmitted boolean NOT NULL, died boolean NOT NULL)`);
    await q.query(`CREATE INDEX analysis_case_facts_month_site ON analysis_case_facts (month, site_id)`);

    const cellColumns = CELL_MEASURES.map((m) => `${m} integer NOT NULL`).join(', ');
    await q.query(`CREATE TABLE analysis_cells (site_id uuid NOT NULL, month date NOT NULL, status smallint NOT NULL, ariscat smallint NOT NULL, incision smallint NOT NULL, therapy boolean NOT NULL, ${cellColumns}, PRIMARY KEY (${CELL_KEY}))`);
    await q.query(`CREATE TABLE analysis_los_cells (site_id uuid NOT NULL, month date NOT NULL, status smallint NOT NULL, ariscat smallint NOT NULL, incision smallint NOT NULL, therapy boolean NOT NULL, los smallint NOT NULL, n integer NOT NULL, PRIMARY KEY (${CELL_KEY}, los))`);
    await q.query(`CREATE INDEX analysis_cells_month ON analysis_cells (month)`);

    // What a case's fact row is, computed from the registry (one definition for triggers and rebuilds).
    await q.query(`CREATE VIEW analysis_case_facts_source AS
      SELECT c.id AS case_id, c.site_id, c.unit_id,
        coalesce(e.types, 0) AS event_types, coalesce(t.modalities, 0) AS modalities,
        c.surgery_date, date_trunc('month', c.surgery_date)::date AS month, t.adherence,
        array_position(${STATUS}, c.status)::smallint AS status,
        array_position(${CATEGORY}, c.procedure_category)::smallint AS category,
        array_position(${INCISION}, c.incision_site)::smallint AS incision,
        array_position(${APPROACH}, c.approach)::smallint AS approach,
        array_position(${URGENCY}, c.urgency)::smallint AS urgency,
        array_position(${ASA}, c.asa_class)::smallint AS asa,
        array_position(${ARISCAT}, c.ariscat_class)::smallint AS ariscat,
        c.age, array_position(${SEX}, c.sex)::smallint AS sex,
        t.first_day AS first_therapy_day,
        (c.discharge_date - c.admission_date)::smallint AS los,
        (c.discharge_date - c.surgery_date)::smallint AS patient_days,
        (t.case_id IS NOT NULL OR coalesce(c.therapy_given, false)) AS therapy,
        coalesce(e.pneumonia, false) AS pneumonia,
        coalesce(c.readmitted_30d, false) AS readmitted,
        coalesce(c.died_30d, false) AS died
      FROM surgical_cases c
      LEFT JOIN (
        SELECT case_id, bit_or(1 << (array_position(${EVENT}, type) - 1)) AS types,
          bool_or(type = 'respiratory-infection' AND pneumonia_nhsn_met) AS pneumonia
        FROM outcome_events WHERE removed_at IS NULL GROUP BY case_id) e ON e.case_id = c.id
      LEFT JOIN (
        SELECT case_id, bit_or(1 << (array_position(${MODALITY}, modality) - 1)) AS modalities,
          min(start_postoperative_day)::smallint AS first_day,
          (sum(least(sessions_delivered, sessions_prescribed)) FILTER (WHERE sessions_delivered IS NOT NULL AND sessions_prescribed > 0)::real
            / nullif(sum(sessions_prescribed) FILTER (WHERE sessions_delivered IS NOT NULL AND sessions_prescribed > 0), 0))::real AS adherence
        FROM therapy_episodes WHERE removed_at IS NULL GROUP BY case_id) t ON t.case_id = c.id`);

    await q.query(`CREATE FUNCTION analysis_bulk() RETURNS boolean LANGUAGE sql STABLE AS $$
      SELECT coalesce(current_setting('alveolog.analysis_bulk', true), '') = 'on' $$`);

    await q.query(`CREATE FUNCTION analysis_refresh_case(p uuid) RETURNS void LANGUAGE sql AS $$
      DELETE FROM analysis_case_facts WHERE case_id = p;
      INSERT INTO analysis_case_facts SELECT * FROM analysis_case_facts_source WHERE case_id = p;
    $$`);

    await q.query(`CREATE FUNCTION analysis_case_changed() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF analysis_bulk() THEN RETURN NULL; END IF;
        IF TG_TABLE_NAME = 'surgical_cases' THEN
          PERFORM analysis_refresh_case(CASE WHEN TG_OP = 'DELETE' THEN OLD.id ELSE NEW.id END);
        ELSE
          IF TG_OP IN ('UPDATE', 'DELETE') THEN PERFORM analysis_refresh_case(OLD.case_id); END IF;
          IF TG_OP = 'INSERT' OR (TG_OP = 'UPDATE' AND NEW.case_id <> OLD.case_id) THEN PERFORM analysis_refresh_case(NEW.case_id); END IF;
        END IF;
        RETURN NULL;
      END $$`);
    for (const table of ['surgical_cases', 'therapy_episodes', 'outcome_events']) {
      await q.query(`CREATE TRIGGER analysis_facts_${table} AFTER INSERT OR UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION analysis_case_changed()`);
    }

    // Roll-ups: subtract the old fact row's cell, add the new one's.
    const add = (row: string, sign: string) => {
      const m = FACT_MEASURES.map((e) => `${sign} * ${e.replaceAll('f.', `${row}.`)}`).join(', ');
      const key = FACT_KEY.replaceAll('f.', `${row}.`);
      return `
        INSERT INTO analysis_cells AS r (${CELL_KEY}, ${CELL_MEASURES.join(', ')}) VALUES (${key}, ${m})
          ON CONFLICT (${CELL_KEY}) DO UPDATE SET ${CELL_MEASURES.map((c) => `${c} = r.${c} + EXCLUDED.${c}`).join(', ')};
        IF ${row}.los IS NOT NULL THEN
          INSERT INTO analysis_los_cells AS r (${CELL_KEY}, los, n) VALUES (${key}, ${row}.los, ${sign})
            ON CONFLICT (${CELL_KEY}, los) DO UPDATE SET n = r.n + EXCLUDED.n;
        END IF;`;
    };
    await q.query(`CREATE FUNCTION analysis_facts_changed() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF analysis_bulk() THEN RETURN NULL; END IF;
        IF TG_OP IN ('UPDATE', 'DELETE') THEN ${add('OLD', '-1')}
          DELETE FROM analysis_cells WHERE n = 0 AND (${CELL_KEY}) = (${FACT_KEY.replaceAll('f.', 'OLD.')});
          DELETE FROM analysis_los_cells WHERE n = 0 AND (${CELL_KEY}, los) = (${FACT_KEY.replaceAll('f.', 'OLD.')}, OLD.los);
        END IF;
        IF TG_OP IN ('INSERT', 'UPDATE') THEN ${add('NEW', '1')} END IF;
        RETURN NULL;
      END $$`);
    await q.query(`CREATE TRIGGER analysis_cells_facts AFTER INSERT OR UPDATE OR DELETE ON analysis_case_facts FOR EACH ROW EXECUTE FUNCTION analysis_facts_changed()`);

    await q.query(`CREATE FUNCTION analysis_rebuild() RETURNS void LANGUAGE plpgsql AS $$
      BEGIN
        PERFORM set_config('alveolog.analysis_bulk', 'on', true);
        DELETE FROM analysis_los_cells; DELETE FROM analysis_cells; DELETE FROM analysis_case_facts;
        INSERT INTO analysis_case_facts SELECT * FROM analysis_case_facts_source ORDER BY month, site_id;
        INSERT INTO analysis_cells (${CELL_KEY}, ${CELL_MEASURES.join(', ')})
          SELECT ${FACT_KEY}, ${FACT_MEASURES.map((e) => `sum(${e})`).join(', ')} FROM analysis_case_facts f GROUP BY 1, 2, 3, 4, 5, 6;
        INSERT INTO analysis_los_cells (${CELL_KEY}, los, n)
          SELECT ${FACT_KEY}, f.los, count(*) FROM analysis_case_facts f WHERE f.los IS NOT NULL GROUP BY 1, 2, 3, 4, 5, 6, 7;
        PERFORM set_config('alveolog.analysis_bulk', 'off', true);
      END $$`);
    await q.query(`SELECT analysis_rebuild()`);
  }

  public async down(q: QueryRunner): Promise<void> {
    for (const table of ['surgical_cases', 'therapy_episodes', 'outcome_events']) await q.query(`DROP TRIGGER IF EXISTS analysis_facts_${table} ON ${table}`);
    await q.query(`DROP FUNCTION IF EXISTS analysis_rebuild()`);
    await q.query(`DROP TABLE IF EXISTS analysis_los_cells`);
    await q.query(`DROP TABLE IF EXISTS analysis_cells`);
    await q.query(`DROP TABLE IF EXISTS analysis_case_facts CASCADE`);
    await q.query(`DROP FUNCTION IF EXISTS analysis_facts_changed()`);
    await q.query(`DROP FUNCTION IF EXISTS analysis_case_changed()`);
    await q.query(`DROP FUNCTION IF EXISTS analysis_refresh_case(uuid)`);
    await q.query(`DROP FUNCTION IF EXISTS analysis_bulk()`);
    await q.query(`DROP VIEW IF EXISTS analysis_case_facts_source`);
    await q.query(`DROP INDEX "public"."IDX_8863c474023bcc2927aac2fa88"`);
    await q.query(`DROP INDEX "public"."IDX_345f7a2a44398abd71b4e4e5b9"`);
    await q.query(`DROP TABLE "saved_cohorts"`);
  }
}
