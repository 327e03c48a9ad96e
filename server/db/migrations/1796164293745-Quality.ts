import { MigrationInterface, QueryRunner } from "typeorm";

export class Quality1796164293745 implements MigrationInterface {
    name = 'Quality1796164293745'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "theatre_list_uploads" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "site_id" uuid NOT NULL, "created_by" uuid, "file_hash" text NOT NULL, "rows" integer NOT NULL, "from_date" date, "to_date" date, "replaced" integer NOT NULL DEFAULT '0', "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_6d68e637fea9c784f6bf1887226" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_84bd3b50aee6a8a27ac9c2323a" ON "theatre_list_uploads"  ("site_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "theatre_list_entries" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "upload_id" uuid NOT NULL, "site_id" uuid NOT NULL, "operation_date" date NOT NULL, "procedure_category" text NOT NULL, "identifier_hash" text NOT NULL, CONSTRAINT "PK_ec02a6d3178694e40672c812ea1" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_aac5f9d9de1fcf7fe459ef4cac" ON "theatre_list_entries"  ("upload_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_b3e53e3df44eabd7cbdf928c10" ON "theatre_list_entries"  ("site_id", "operation_date") `);
        await queryRunner.query(`CREATE TABLE "reabstraction_samples" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "seed" bigint NOT NULL, "size" integer NOT NULL, "pool_size" integer NOT NULL, "site_ids" uuid array NOT NULL, "fields" text array NOT NULL, "reabstractor_id" uuid NOT NULL, "surgery_from" date, "surgery_to" date, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_5d5ba2440a1408ce0ae9f7289ff" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_7b82f9a5f33b756c84c88566a9" ON "reabstraction_samples"  ("created_at") `);
        await queryRunner.query(`CREATE TABLE "reabstraction_items" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "sample_id" uuid NOT NULL, "case_id" uuid NOT NULL, "ordinal" integer NOT NULL, "original_values" jsonb NOT NULL, "original_version" integer NOT NULL, "entered_values" jsonb, "entered_by" uuid, "entered_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "UQ_ef43291c41b5a585d7611819309" UNIQUE ("sample_id", "case_id"), CONSTRAINT "PK_f26de4a02c5259f5062148a4f70" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_c8a6e2a3df9708cf075f65c324" ON "reabstraction_items"  ("case_id") `);
        await queryRunner.query(`CREATE TABLE "reabstraction_adjudications" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "item_id" uuid NOT NULL, "field" text NOT NULL, "decision" text NOT NULL, "value" jsonb, "reason" text NOT NULL, "written" boolean NOT NULL DEFAULT false, "decided_by" uuid, "decided_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_ef4d1fd47d2e5ad2c33070af4e5" UNIQUE ("item_id", "field"), CONSTRAINT "PK_1e42c0d19d93536e872f9d903fc" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "quality_findings" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "kind" text NOT NULL, "case_id" uuid NOT NULL, "site_id" uuid NOT NULL, "fingerprint" text NOT NULL, "message" text NOT NULL, "details" jsonb NOT NULL DEFAULT '{}', "status" text NOT NULL DEFAULT 'open', "first_found_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "last_found_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "last_job_id" uuid, "reviewed_by" uuid, "reviewed_at" TIMESTAMP WITH TIME ZONE, "review_reason" text, CONSTRAINT "PK_9a24d47903f39c1691c14c85f9c" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_2beb735067c1a8603b5f21520a" ON "quality_findings"  ("case_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_42b0fbe7b63e758da9276235b5" ON "quality_findings"  ("site_id", "status", "kind") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_dc6a050bce9f874d99b77e9e40" ON "quality_findings"  ("fingerprint") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_dc6a050bce9f874d99b77e9e40"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_42b0fbe7b63e758da9276235b5"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_2beb735067c1a8603b5f21520a"`);
        await queryRunner.query(`DROP TABLE "quality_findings"`);
        await queryRunner.query(`DROP TABLE "reabstraction_adjudications"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c8a6e2a3df9708cf075f65c324"`);
        await queryRunner.query(`DROP TABLE "reabstraction_items"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_7b82f9a5f33b756c84c88566a9"`);
        await queryRunner.query(`DROP TABLE "reabstraction_samples"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_b3e53e3df44eabd7cbdf928c10"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_aac5f9d9de1fcf7fe459ef4cac"`);
        await queryRunner.query(`DROP TABLE "theatre_list_entries"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_84bd3b50aee6a8a27ac9c2323a"`);
        await queryRunner.query(`DROP TABLE "theatre_list_uploads"`);
    }

}
