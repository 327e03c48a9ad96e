import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * `analysis_refresh_cases(ids)`: the fact rows and roll-ups of many cases recomputed set-wise,
 * for bulk writes (an import commit) that set `alveolog.analysis_bulk` to skip the row triggers:
 * one trigger round per inserted case, episode and event cost a 50,000-case import most of its
 * time. The old fact rows are taken out of the roll-ups, the new ones computed from
 * `analysis_case_facts_source` and added back, and emptied cells of the touched months deleted.
 *
 * Each fact row also records whether its case is complete (`case_completeness.complete`): the
 * worklist counted and paged incomplete cases by computing the completeness view for every
 * open case of the user's sites on each request (a third of the database's time under load);
 * now it reads a partial index and computes the view for the page only. The source view is
 * renamed `analysis_case_facts_base` and the new `analysis_case_facts_source` adds the column
 * last, so `INSERT ... SELECT *` keeps matching the table.
 *
 * Also an index for the case list filtered by site and status and sorted by ARISCAT points
 * (surgery date included, so a date range is checked on the index without visiting the table).
 *
 * The key and measure lists are frozen copies of the AnalysisCohorts migration's.
 */
const ANY_PPC_MASK = 247;
const CELL_KEY = 'site_id, month, status, ariscat, incision, therapy';
const CELL_MEASURES = ['n', 'any_ppc', 'atelectasis', 'pneumonia', 'respiratory_infection', 'respiratory_failure', 'reintubation', 'ards', 'readmitted', 'died', 'discharged', 'patient_days', 'pneumonia_discharged'];
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

/** Adds (sign 1) or subtracts (sign -1) the fact rows of `ids` to the two roll-up tables. */
const rollUp = (sign: number) => `
  INSERT INTO analysis_cells AS r (${CELL_KEY}, ${CELL_MEASURES.join(', ')})
    SELECT ${FACT_KEY}, ${FACT_MEASURES.map((e) => `${sign} * sum(${e})`).join(', ')}
      FROM analysis_case_facts f WHERE f.case_id = ANY(ids) GROUP BY 1, 2, 3, 4, 5, 6
    ON CONFLICT (${CELL_KEY}) DO UPDATE SET ${CELL_MEASURES.map((c) => `${c} = r.${c} + EXCLUDED.${c}`).join(', ')};
  INSERT INTO analysis_los_cells AS r (${CELL_KEY}, los, n)
    SELECT ${FACT_KEY}, f.los, ${sign} * count(*)
      FROM analysis_case_facts f WHERE f.case_id = ANY(ids) AND f.los IS NOT NULL GROUP BY 1, 2, 3, 4, 5, 6, 7
    ON CONFLICT (${CELL_KEY}, los) DO UPDATE SET n = r.n + EXCLUDED.n;`;

export class BulkRefreshAndListIndex1796200000000 implements MigrationInterface {
  name = 'BulkRefreshAndListIndex1796200000000';

  public async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE FUNCTION analysis_refresh_cases(ids uuid[]) RETURNS void LANGUAGE plpgsql AS $$
      DECLARE
        was text := coalesce(current_setting('alveolog.analysis_bulk', true), '');
        months date[];
      BEGIN
        PERFORM set_config('alveolog.analysis_bulk', 'on', true);
        SELECT array_agg(DISTINCT month) INTO months FROM analysis_case_facts WHERE case_id = ANY(ids);
        ${rollUp(-1)}
        DELETE FROM analysis_case_facts WHERE case_id = ANY(ids);
        INSERT INTO analysis_case_facts SELECT * FROM analysis_case_facts_source WHERE case_id = ANY(ids);
        ${rollUp(1)}
        IF months IS NOT NULL THEN
          DELETE FROM analysis_cells WHERE n = 0 AND month = ANY(months);
          DELETE FROM analysis_los_cells WHERE n = 0 AND month = ANY(months);
        END IF;
        PERFORM set_config('alveolog.analysis_bulk', was, true);
      END $$`);
    await q.query(`ALTER VIEW analysis_case_facts_source RENAME TO analysis_case_facts_base`);
    await q.query(`CREATE VIEW analysis_case_facts_source AS
      SELECT b.*, coalesce(cc.complete, false) AS complete FROM analysis_case_facts_base b LEFT JOIN case_completeness cc ON cc.case_id = b.case_id`);
    await q.query(`ALTER TABLE analysis_case_facts ADD COLUMN complete boolean NOT NULL DEFAULT false`);
    // Bulk mode: the roll-ups do not depend on the new column, so the cell trigger is skipped.
    await q.query(`SELECT set_config('alveolog.analysis_bulk', 'on', true)`);
    await q.query(`UPDATE analysis_case_facts f SET complete = true FROM case_completeness cc WHERE cc.case_id = f.case_id AND cc.complete`);
    await q.query(`SELECT set_config('alveolog.analysis_bulk', 'off', true)`);
    // Status codes 1 and 2: draft and complete (the order of the AnalysisCohorts migration's list).
    await q.query(`CREATE INDEX analysis_case_facts_incomplete ON analysis_case_facts (surgery_date, case_id) INCLUDE (site_id) WHERE NOT complete AND status IN (1, 2)`);
    await q.query(`CREATE INDEX "IDX_cases_site_status_ariscat" ON "surgical_cases" ("site_id", "status", "ariscat_points" DESC NULLS LAST, "id" DESC) INCLUDE ("surgery_date")`);
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "public"."IDX_cases_site_status_ariscat"`);
    await q.query(`DROP INDEX analysis_case_facts_incomplete`);
    await q.query(`DROP VIEW analysis_case_facts_source`);
    await q.query(`ALTER TABLE analysis_case_facts DROP COLUMN complete`);
    await q.query(`ALTER VIEW analysis_case_facts_base RENAME TO analysis_case_facts_source`);
    await q.query(`DROP FUNCTION IF EXISTS analysis_refresh_cases(uuid[])`);
  }
}
