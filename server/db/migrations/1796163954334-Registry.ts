import { MigrationInterface, QueryRunner } from "typeorm";

export class Registry1796163954334 implements MigrationInterface {
    name = 'Registry1796163954334'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "surgical_cases" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "registry_number" text NOT NULL, "registry_year" integer NOT NULL, "registry_seq" integer NOT NULL, "site_id" uuid NOT NULL, "unit_id" uuid, "status" text NOT NULL DEFAULT 'draft', "version" integer NOT NULL DEFAULT '1', "created_via" text NOT NULL DEFAULT 'form', "eligible" boolean, "exclusion_reason" text, "admission_date" date, "age" smallint, "sex" text, "height_cm" numeric(5,1), "weight_kg" numeric(5,1), "asa_class" text, "asa_emergency" boolean, "smoking_status" text, "copd" boolean, "obstructive_sleep_apnoea" boolean, "heart_failure" boolean, "preop_spo2" smallint, "preop_haemoglobin_g_dl" numeric(4,2), "respiratory_infection_last_month" boolean, "functional_status" text, "surgery_date" date NOT NULL, "procedure_category" text, "incision_site" text, "approach" text, "urgency" text, "anaesthesia" text, "duration_minutes" integer, "ariscat_points" smallint, "ariscat_class" text, "therapy_given" boolean, "complications_reviewed" boolean, "discharge_date" date, "icu_days" smallint, "ventilator_days" smallint, "readmitted_30d" boolean, "readmission_cause" text, "died_30d" boolean, "death_date" date, "follow_up_completed_on" date, "notes" text, "identifier_hash" text, "possible_duplicate" boolean NOT NULL DEFAULT false, "warnings" jsonb NOT NULL DEFAULT '[]', "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_by" uuid, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "editors_since_verification" uuid array NOT NULL DEFAULT '{}', "completed_at" TIMESTAMP WITH TIME ZONE, "verified_by" uuid, "verified_at" TIMESTAMP WITH TIME ZONE, "locked_by" uuid, "locked_at" TIMESTAMP WITH TIME ZONE, "withdrawn_by" uuid, "withdrawn_at" TIMESTAMP WITH TIME ZONE, "withdrawn_reason" text, CONSTRAINT "UQ_db2cadc691221e3b2f149640716" UNIQUE ("registry_number"), CONSTRAINT "CHK_cases_version" CHECK ("version" >= 1), CONSTRAINT "CHK_cases_status" CHECK ("status" IN ('draft', 'complete', 'verified', 'locked', 'withdrawn')), CONSTRAINT "PK_570744922c7c6026307e9769c71" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_edbe2b441dd29735cb51167bf1" ON "surgical_cases"  ("site_id", "registry_year", "registry_seq") `);
        await queryRunner.query(`CREATE TABLE "therapy_episodes" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "case_id" uuid NOT NULL, "modality" text NOT NULL, "start_postoperative_day" smallint, "end_postoperative_day" smallint, "prescribed_sessions_per_day" smallint, "sessions_prescribed" integer, "sessions_delivered" integer, "delivered_above_prescribed_reason" text, "session_minutes" numeric(6,1), "interface" text, "nose_clip" boolean, "aerosol_medication" boolean, "source_gas" text, "flow_lpm" numeric(4,1), "expiratory_pressure_cm_h2o" numeric(4,1), "volume_target_ml" integer, "inspiratory_capacity_ml" integer, "vital_capacity_ml" integer, "predicted_body_weight_kg" numeric(5,1), "tolerance" text, "adverse_events" text array, "adverse_event_note" text, "stop_reason" text, "warnings" jsonb NOT NULL DEFAULT '[]', "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "removed_at" TIMESTAMP WITH TIME ZONE, "removed_by" uuid, "removed_reason" text, CONSTRAINT "PK_8dcc07883b5796fa8f98ec478a5" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_6a362a08bea64380688a87464e" ON "therapy_episodes"  ("case_id") `);
        await queryRunner.query(`CREATE TABLE "outcome_events" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "case_id" uuid NOT NULL, "type" text NOT NULL, "onset_postoperative_day" smallint NOT NULL, "clavien_dindo" text, "clavien_dindo_disability" boolean, "observations" jsonb NOT NULL DEFAULT '[]', "notes" text, "definition" text NOT NULL, "definition_version" text NOT NULL, "evaluations" jsonb NOT NULL DEFAULT '[]', "pneumonia_nhsn_met" boolean NOT NULL DEFAULT false, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "removed_at" TIMESTAMP WITH TIME ZONE, "removed_by" uuid, "removed_reason" text, CONSTRAINT "PK_b3ae533d5fc11f988690ea1b0c7" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_6644e4457348a89327495c0406" ON "outcome_events"  ("type", "case_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_f6f4ced3b5f735c4f77b0809b8" ON "outcome_events"  ("case_id") `);
        await queryRunner.query(`ALTER TABLE "surgical_cases" ADD CONSTRAINT "FK_c501e50af91cae12c390fa11b37" FOREIGN KEY ("site_id") REFERENCES "sites"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "surgical_cases" ADD CONSTRAINT "FK_eebc0d545f8b6e59d3262454352" FOREIGN KEY ("unit_id") REFERENCES "units"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "therapy_episodes" ADD CONSTRAINT "FK_6a362a08bea64380688a87464e0" FOREIGN KEY ("case_id") REFERENCES "surgical_cases"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "outcome_events" ADD CONSTRAINT "FK_f6f4ced3b5f735c4f77b0809b81" FOREIGN KEY ("case_id") REFERENCES "surgical_cases"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);

        // --- By hand: indexes that keep the case list fast at a million cases (declared with
        // synchronize: false in the entity so migration:generate leaves them alone).
        await queryRunner.query(`CREATE INDEX "IDX_cases_site_surgery" ON "surgical_cases" ("site_id", "surgery_date" DESC, "id" DESC)`);
        await queryRunner.query(`CREATE INDEX "IDX_cases_surgery" ON "surgical_cases" ("surgery_date" DESC, "id" DESC)`);
        await queryRunner.query(`CREATE INDEX "IDX_cases_site_status_surgery" ON "surgical_cases" ("site_id", "status", "surgery_date" DESC)`);
        await queryRunner.query(`CREATE INDEX "IDX_cases_site_category_surgery" ON "surgical_cases" ("site_id", "procedure_category", "surgery_date" DESC)`);
        await queryRunner.query(`CREATE INDEX "IDX_cases_site_class_surgery" ON "surgical_cases" ("site_id", "ariscat_class", "surgery_date" DESC)`);
        await queryRunner.query(`CREATE INDEX "IDX_cases_site_updated" ON "surgical_cases" ("site_id", "updated_at" DESC)`);
        // Registry-number search by prefix (LIKE 'HBR-2025%') under any collation.
        await queryRunner.query(`CREATE INDEX "IDX_cases_registry_number_pattern" ON "surgical_cases" ("registry_number" text_pattern_ops)`);
        // Worklist: open 30-day follow-ups (few rows, read by surgery date).
        await queryRunner.query(`CREATE INDEX "IDX_cases_followup_open" ON "surgical_cases" ("site_id", "surgery_date") WHERE "follow_up_completed_on" IS NULL AND "status" IN ('draft', 'complete', 'verified')`);
        // Duplicate and returning-patient checks look up the keyed hash (most cases have none).
        await queryRunner.query(`CREATE INDEX "IDX_cases_identifier_hash" ON "surgical_cases" ("identifier_hash", "surgery_date") WHERE "identifier_hash" IS NOT NULL`);

        // --- By hand: views computing shared/registry/derived.ts and completeness.ts in SQL.
        // Generated by server/registry/views.ts at the time of this migration (frozen here;
        // tests/server/registry/views.test.ts checks that the two still agree).
        await queryRunner.query(`CREATE VIEW case_derived AS
SELECT c.id AS case_id, c.site_id, c.status, c.surgery_date,
  to_char(c.surgery_date, 'YYYY-MM') AS surveillance_month,
  c.status IN ('complete', 'verified', 'locked') AS counts_in_analysis,
  CASE WHEN c.discharge_date >= c.admission_date THEN c.discharge_date - c.admission_date END AS length_of_stay_days,
  CASE WHEN c.discharge_date >= c.surgery_date THEN c.discharge_date - c.surgery_date END AS postoperative_stay_days,
  CASE WHEN c.discharge_date >= c.surgery_date THEN c.discharge_date - c.surgery_date END AS patient_days,
  c.surgery_date + 30 AS follow_up_window_end,
  (SELECT min(e.start_postoperative_day) FROM therapy_episodes e WHERE e.case_id = c.id AND e.removed_at IS NULL)::int AS days_to_first_therapy,
  EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type IN ('respiratory-infection', 'respiratory-failure', 'bronchospasm', 'atelectasis', 'pleural-effusion', 'pneumothorax', 'aspiration-pneumonitis')) AS any_ppc,
  EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type = 'respiratory-infection' AND o.pneumonia_nhsn_met) AS pneumonia_nhsn,
  EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type = 'reintubation') AS reintubation,
  EXISTS (SELECT 1 FROM outcome_events o WHERE o.case_id = c.id AND o.removed_at IS NULL AND o.type = 'ards') AS ards,
  c.ariscat_points, c.ariscat_class
FROM surgical_cases c`);
        await queryRunner.query(`CREATE VIEW therapy_episode_derived AS
SELECT e.id AS episode_id, e.case_id, e.modality, e.start_postoperative_day,
  CASE WHEN e.sessions_prescribed > 0 AND e.sessions_delivered IS NOT NULL
       THEN LEAST(1, e.sessions_delivered::numeric / e.sessions_prescribed) END AS adherence
FROM therapy_episodes e
WHERE e.removed_at IS NULL`);
        await queryRunner.query(`CREATE VIEW analysed_cases AS
SELECT d.* FROM case_derived d WHERE d.counts_in_analysis`);
        await queryRunner.query(`CREATE VIEW case_completeness AS
SELECT c.id AS case_id, c.site_id, c.status, c.surgery_date, m.missing_patient, m.missing_operation, m.missing_therapy, m.missing_outcomes, m.missing_follow_up, a.missing, cardinality(a.missing) = 0 AS complete
FROM surgical_cases c
LEFT JOIN LATERAL (
  SELECT bool_or(true) AS any_episode,
         array_agg('therapy.' || e.id || '.' || f.name ORDER BY e.created_at, e.id, f.ord) FILTER (WHERE f.missing) AS missing
    FROM therapy_episodes e CROSS JOIN LATERAL (VALUES (0, 'modality', e.modality IS NULL), (1, 'startPostoperativeDay', e.start_postoperative_day IS NULL), (2, 'sessionsPrescribed', e.sessions_prescribed IS NULL), (3, 'sessionsDelivered', e.sessions_delivered IS NULL)) AS f(ord, name, missing)
   WHERE e.case_id = c.id AND e.removed_at IS NULL
) te ON true
LEFT JOIN LATERAL (
  SELECT array_agg('outcomes.' || o.id || '.' || f.name ORDER BY o.created_at, o.id, f.ord) FILTER (WHERE f.missing) AS missing
    FROM outcome_events o CROSS JOIN LATERAL (VALUES (0, 'type', o.type IS NULL), (1, 'onsetPostoperativeDay', o.onset_postoperative_day IS NULL), (2, 'clavienDindo', o.clavien_dindo IS NULL)) AS f(ord, name, missing)
   WHERE o.case_id = c.id AND o.removed_at IS NULL
) oe ON true
CROSS JOIN LATERAL (
  SELECT
    array_remove(ARRAY[CASE WHEN c.eligible IS DISTINCT FROM false AND c.eligible IS NULL THEN 'eligible' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.admission_date IS NULL THEN 'admissionDate' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.age IS NULL THEN 'age' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.sex, '') IS NULL THEN 'sex' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.height_cm IS NULL THEN 'heightCm' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.weight_kg IS NULL THEN 'weightKg' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.asa_class, '') IS NULL THEN 'asaClass' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.asa_emergency IS NULL THEN 'asaEmergency' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.smoking_status, '') IS NULL THEN 'smokingStatus' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.copd IS NULL THEN 'copd' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.obstructive_sleep_apnoea IS NULL THEN 'obstructiveSleepApnoea' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.heart_failure IS NULL THEN 'heartFailure' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.preop_spo2 IS NULL THEN 'preopSpO2' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.preop_haemoglobin_g_dl IS NULL THEN 'preopHaemoglobin' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.respiratory_infection_last_month IS NULL THEN 'respiratoryInfectionLastMonth' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.functional_status, '') IS NULL THEN 'functionalStatus' END,
      CASE WHEN c.eligible = false AND c.eligible IS NULL THEN 'eligible' END,
      CASE WHEN c.eligible = false AND NULLIF(c.exclusion_reason, '') IS NULL THEN 'exclusionReason' END]::text[], NULL) AS missing_patient,
    array_remove(ARRAY[CASE WHEN c.eligible IS DISTINCT FROM false AND c.surgery_date IS NULL THEN 'surgeryDate' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.procedure_category, '') IS NULL THEN 'procedureCategory' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.incision_site, '') IS NULL THEN 'incisionSite' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.approach, '') IS NULL THEN 'approach' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.urgency, '') IS NULL THEN 'urgency' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND NULLIF(c.anaesthesia, '') IS NULL THEN 'anaesthesia' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.duration_minutes IS NULL THEN 'durationMinutes' END,
      CASE WHEN c.eligible = false AND c.surgery_date IS NULL THEN 'surgeryDate' END]::text[], NULL) AS missing_operation,
    array_remove(ARRAY[CASE WHEN c.eligible IS DISTINCT FROM false AND c.therapy_given IS NULL THEN 'therapyGiven' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.therapy_given = true AND NOT COALESCE(te.any_episode, false) THEN 'therapy.episodes' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.therapy_given = false AND COALESCE(te.any_episode, false) THEN 'therapyGiven' END]::text[], NULL)
      || CASE WHEN c.eligible IS DISTINCT FROM false THEN COALESCE(te.missing, '{}') ELSE '{}' END AS missing_therapy,
    array_remove(ARRAY[CASE WHEN c.eligible IS DISTINCT FROM false AND c.complications_reviewed IS DISTINCT FROM true THEN 'complicationsReviewed' END]::text[], NULL)
      || CASE WHEN c.eligible IS DISTINCT FROM false THEN COALESCE(oe.missing, '{}') ELSE '{}' END AS missing_outcomes,
    array_remove(ARRAY[CASE WHEN c.eligible IS DISTINCT FROM false AND c.discharge_date IS NULL THEN 'dischargeDate' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.icu_days IS NULL THEN 'icuDays' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.ventilator_days IS NULL THEN 'ventilatorDays' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.readmitted_30d IS NULL THEN 'readmitted30d' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.readmitted_30d = true AND NULLIF(c.readmission_cause, '') IS NULL THEN 'readmissionCause' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.died_30d IS NULL THEN 'died30d' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.died_30d = true AND c.death_date IS NULL THEN 'deathDate' END,
      CASE WHEN c.eligible IS DISTINCT FROM false AND c.follow_up_completed_on IS NULL THEN 'followUpCompletedOn' END]::text[], NULL) AS missing_follow_up
  OFFSET 0
) m
CROSS JOIN LATERAL (SELECT m.missing_patient || m.missing_operation || m.missing_therapy || m.missing_outcomes || m.missing_follow_up AS missing OFFSET 0) a`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP VIEW "case_completeness"`);
        await queryRunner.query(`DROP VIEW "analysed_cases"`);
        await queryRunner.query(`DROP VIEW "therapy_episode_derived"`);
        await queryRunner.query(`DROP VIEW "case_derived"`);
        for (const i of ['IDX_cases_site_surgery', 'IDX_cases_surgery', 'IDX_cases_site_status_surgery', 'IDX_cases_site_category_surgery', 'IDX_cases_site_class_surgery', 'IDX_cases_site_updated', 'IDX_cases_registry_number_pattern', 'IDX_cases_identifier_hash', 'IDX_cases_followup_open']) {
            await queryRunner.query(`DROP INDEX "public"."${i}"`);
        }
        await queryRunner.query(`ALTER TABLE "outcome_events" DROP CONSTRAINT "FK_f6f4ced3b5f735c4f77b0809b81"`);
        await queryRunner.query(`ALTER TABLE "therapy_episodes" DROP CONSTRAINT "FK_6a362a08bea64380688a87464e0"`);
        await queryRunner.query(`ALTER TABLE "surgical_cases" DROP CONSTRAINT "FK_eebc0d545f8b6e59d3262454352"`);
        await queryRunner.query(`ALTER TABLE "surgical_cases" DROP CONSTRAINT "FK_c501e50af91cae12c390fa11b37"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_f6f4ced3b5f735c4f77b0809b8"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_6644e4457348a89327495c0406"`);
        await queryRunner.query(`DROP TABLE "outcome_events"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_6a362a08bea64380688a87464e"`);
        await queryRunner.query(`DROP TABLE "therapy_episodes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_edbe2b441dd29735cb51167bf1"`);
        await queryRunner.query(`DROP TABLE "surgical_cases"`);
    }

}
