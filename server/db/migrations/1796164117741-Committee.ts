import { MigrationInterface, QueryRunner } from "typeorm";

export class Committee1796164117741 implements MigrationInterface {
    name = 'Committee1796164117741'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "committee_measure_settings" ("measure_key" text NOT NULL, "enabled" boolean NOT NULL DEFAULT true, "baseline_start" date, "baseline_end" date, "updated_by" uuid, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_b233829fe5659e2351ff039f525" PRIMARY KEY ("measure_key"))`);
        await queryRunner.query(`CREATE TABLE "committee_annotations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "site_id" uuid, "month" date NOT NULL, "text" text NOT NULL, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "removed_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_692b5354f2c4bdb33f8af1ae5f0" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_947d9ca0c460c9c7f7a0e4783d" ON "committee_annotations"  ("site_id", "month") `);
        await queryRunner.query(`CREATE TABLE "committee_month_closes" ("month" date NOT NULL, "closed" boolean NOT NULL DEFAULT false, "closed_at" TIMESTAMP WITH TIME ZONE, "closed_by" uuid, "published_at" TIMESTAMP WITH TIME ZONE, "published_by" uuid, "packet_job_id" uuid, CONSTRAINT "PK_d0a1b6da75982b1ec184d3f5588" PRIMARY KEY ("month"))`);
        await queryRunner.query(`CREATE TABLE "committee_month_rollups" ("site_id" uuid NOT NULL, "month" date NOT NULL, "cases" integer NOT NULL, "any_ppc" integer NOT NULL, "atelectasis" integer NOT NULL, "pneumonia" integer NOT NULL, "pneumonia_discharged" integer NOT NULL, "discharged_cases" integer NOT NULL, "patient_days" integer NOT NULL, "followed_up" integer NOT NULL, "respiratory_readmissions" integer NOT NULL, "at_risk" integer NOT NULL, "early_therapy" integer NOT NULL, "adherence_cases" integer NOT NULL, "adherence_sum" double precision NOT NULL, "los_frequencies" jsonb NOT NULL DEFAULT '[]', "computed_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_3d25d35c3c5cdfb0e19e003b387" PRIMARY KEY ("site_id", "month"))`);
        await queryRunner.query(`CREATE TABLE "committee_reviews" ("month" date NOT NULL, "signed_by" uuid, "signed_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_cfa756bfa9a57d414d3d76b50f8" PRIMARY KEY ("month"))`);
        await queryRunner.query(`CREATE TABLE "committee_findings" ("month" date NOT NULL, "measure_key" text NOT NULL, "signal_seen" boolean NOT NULL, "discussion" text NOT NULL DEFAULT '', "updated_by" uuid, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_0a165a589820d6631286695307b" PRIMARY KEY ("month", "measure_key"))`);
        await queryRunner.query(`CREATE TABLE "committee_actions" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "month" date NOT NULL, "measure_key" text NOT NULL, "description" text NOT NULL, "owner_id" uuid NOT NULL, "due_date" date NOT NULL, "status" text NOT NULL DEFAULT 'open', "note" text, "done_at" TIMESTAMP WITH TIME ZONE, "last_reminded_at" TIMESTAMP WITH TIME ZONE, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_8e6d34094a56ea92ba9c73af13c" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_f689dceb05801f65a50d8f02c3" ON "committee_actions"  ("status", "due_date") `);
        await queryRunner.query(`CREATE TABLE "committee_signal_notices" ("measure_key" text NOT NULL, "scope" text NOT NULL, "rule" text NOT NULL, "start_period" text NOT NULL, "end_period" text NOT NULL, "notified_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_0e1ae73ba35709c8fcc43cf1ed3" PRIMARY KEY ("measure_key", "scope", "rule", "start_period"))`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TABLE "committee_signal_notices"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_f689dceb05801f65a50d8f02c3"`);
        await queryRunner.query(`DROP TABLE "committee_actions"`);
        await queryRunner.query(`DROP TABLE "committee_findings"`);
        await queryRunner.query(`DROP TABLE "committee_reviews"`);
        await queryRunner.query(`DROP TABLE "committee_month_rollups"`);
        await queryRunner.query(`DROP TABLE "committee_month_closes"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_947d9ca0c460c9c7f7a0e4783d"`);
        await queryRunner.query(`DROP TABLE "committee_annotations"`);
        await queryRunner.query(`DROP TABLE "committee_measure_settings"`);
    }

}
