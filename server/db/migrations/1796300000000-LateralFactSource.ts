import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The fact view's two aggregates become LATERAL subqueries keyed by the case. As plain grouped
 * subqueries PostgreSQL could push an equality on the case into them (one case: the triggers),
 * but not `case_id = ANY(ids)`: every set-wise refresh of 20,000 cases aggregated all therapy
 * episodes and outcome events of the registry first (1.2 of its 1.45 s). Same columns, same
 * rows (checked on the 1,000,000-case benchmark database with EXCEPT both ways); a full rebuild
 * is slower (1.2 -> 2.9 s there), which only `analysis_rebuild()` pays.
 *
 * `analysis_refresh_cases` also runs without JIT: its statements are costed like scans of the
 * whole registry, so PostgreSQL compiled them for each call (about 1.8 s of a 4.3 s call for
 * 20,000 cases) to then touch a few thousand index entries.
 *
 * Both view texts are frozen copies: pg_get_viewdef of the earlier definition (`lateral` false)
 * and that text with the two joins made LATERAL, which is all that differs.
 */
const factView = (lateral: boolean) => `CREATE OR REPLACE VIEW analysis_case_facts_base AS
     SELECT c.id AS case_id,
        c.site_id,
        c.unit_id,
        COALESCE(e.types, 0) AS event_types,
        COALESCE(t.modalities, 0) AS modalities,
        c.surgery_date,
        date_trunc('month'::text, c.surgery_date::timestamp with time zone)::date AS month,
        t.adherence,
        array_position(ARRAY['draft'::text, 'complete'::text, 'verified'::text, 'locked'::text, 'withdrawn'::text], c.status)::smallint AS status,
        array_position(ARRAY['upper-gastrointestinal'::text, 'hepatobiliary-pancreatic'::text, 'colorectal'::text, 'abdominal-wall-hernia'::text, 'thoracic'::text, 'cardiac'::text, 'vascular'::text, 'orthopaedic'::text, 'spinal'::text, 'urological'::text, 'gynaecological'::text, 'head-and-neck'::text, 'neurosurgical'::text, 'breast-and-plastic'::text, 'other'::text], c.procedure_category)::smallint AS category,
        array_position(ARRAY['peripheral'::text, 'head-neck'::text, 'intracranial'::text, 'spine'::text, 'chest-wall-breast'::text, 'lower-abdominal'::text, 'upper-abdominal'::text, 'upper-and-lower-abdominal'::text, 'intrathoracic'::text, 'thoraco-abdominal'::text], c.incision_site)::smallint AS incision,
        array_position(ARRAY['open'::text, 'laparoscopic'::text, 'robotic'::text], c.approach)::smallint AS approach,
        array_position(ARRAY['elective'::text, 'emergency'::text], c.urgency)::smallint AS urgency,
        array_position(ARRAY['I'::text, 'II'::text, 'III'::text, 'IV'::text, 'V'::text, 'VI'::text], c.asa_class)::smallint AS asa,
        array_position(ARRAY['low'::text, 'intermediate'::text, 'high'::text], c.ariscat_class)::smallint AS ariscat,
        c.age,
        array_position(ARRAY['female'::text, 'male'::text], c.sex)::smallint AS sex,
        t.first_day AS first_therapy_day,
        (c.discharge_date - c.admission_date)::smallint AS los,
        (c.discharge_date - c.surgery_date)::smallint AS patient_days,
        t.case_id IS NOT NULL OR COALESCE(c.therapy_given, false) AS therapy,
        COALESCE(e.pneumonia, false) AS pneumonia,
        COALESCE(c.readmitted_30d, false) AS readmitted,
        COALESCE(c.died_30d, false) AS died
       FROM surgical_cases c
         LEFT JOIN ${lateral ? 'LATERAL ' : ''}( SELECT outcome_events.case_id,
                bit_or(1 << (array_position(ARRAY['atelectasis'::text, 'respiratory-infection'::text, 'respiratory-failure'::text, 'reintubation'::text, 'bronchospasm'::text, 'aspiration-pneumonitis'::text, 'pleural-effusion'::text, 'pneumothorax'::text, 'ards'::text], outcome_events.type) - 1)) AS types,
                bool_or(outcome_events.type = 'respiratory-infection'::text AND outcome_events.pneumonia_nhsn_met) AS pneumonia
               FROM outcome_events
              WHERE outcome_events.removed_at IS NULL${lateral ? ' AND outcome_events.case_id = c.id' : ''}
              GROUP BY outcome_events.case_id) e ON ${lateral ? 'true' : 'e.case_id = c.id'}
         LEFT JOIN ${lateral ? 'LATERAL ' : ''}( SELECT therapy_episodes.case_id,
                bit_or(1 << (array_position(ARRAY['incentive-spirometry'::text, 'pep'::text, 'pap-device'::text, 'cpap'::text, 'ippb'::text, 'chest-physiotherapy'::text, 'early-mobilisation'::text], therapy_episodes.modality) - 1)) AS modalities,
                min(therapy_episodes.start_postoperative_day) AS first_day,
                (sum(LEAST(therapy_episodes.sessions_delivered, therapy_episodes.sessions_prescribed)) FILTER (WHERE therapy_episodes.sessions_delivered IS NOT NULL AND therapy_episodes.sessions_prescribed > 0)::real / NULLIF(sum(therapy_episodes.sessions_prescribed) FILTER (WHERE therapy_episodes.sessions_delivered IS NOT NULL AND therapy_episodes.sessions_prescribed > 0), 0)::double precision)::real AS adherence
               FROM therapy_episodes
              WHERE therapy_episodes.removed_at IS NULL${lateral ? ' AND therapy_episodes.case_id = c.id' : ''}
              GROUP BY therapy_episodes.case_id) t ON ${lateral ? 'true' : 't.case_id = c.id'}`;

export class LateralFactSource1796300000000 implements MigrationInterface {
  name = 'LateralFactSource1796300000000';

  public async up(q: QueryRunner): Promise<void> {
    await q.query(factView(true));
    await q.query(`ALTER FUNCTION analysis_refresh_cases(uuid[]) SET jit = off`);
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER FUNCTION analysis_refresh_cases(uuid[]) RESET jit`);
    await q.query(factView(false));
  }
}
