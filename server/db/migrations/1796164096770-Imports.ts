import { MigrationInterface, QueryRunner } from "typeorm";

export class Imports1796164096770 implements MigrationInterface {
    name = 'Imports1796164096770'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "import_jobs" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "site_id" uuid NOT NULL, "created_by" uuid, "file_name" text NOT NULL, "file_hash" text NOT NULL, "file_size" bigint NOT NULL, "file_type" text NOT NULL, "stored_path" text, "decimal" text NOT NULL DEFAULT 'point', "default_kind" text NOT NULL DEFAULT 'cases', "status" text NOT NULL DEFAULT 'uploaded', "sheets" jsonb NOT NULL DEFAULT '[]', "mapping" jsonb, "counts" jsonb, "problems" jsonb NOT NULL DEFAULT '[]', "problem_count" integer NOT NULL DEFAULT '0', "policy" text, "dry_run_job_id" uuid, "commit_job_id" uuid, "error" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "validated_at" TIMESTAMP WITH TIME ZONE, "committed_at" TIMESTAMP WITH TIME ZONE, "abandoned_at" TIMESTAMP WITH TIME ZONE, "file_deleted_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_4d206c602f173f98e4bb85819a3" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_8a3202f5466b0c3cc5e949e0f9" ON "import_jobs"  ("file_hash") `);
        await queryRunner.query(`CREATE INDEX "IDX_063b950263be9f699e2185564f" ON "import_jobs"  ("site_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "import_mapping_presets" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "site_id" uuid NOT NULL, "name" text NOT NULL, "mapping" jsonb NOT NULL, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_ee12fbb24523f2d74de26c27ffc" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_b3b4d9d9a073edd19acd8022f6" ON "import_mapping_presets"  ("site_id", "name") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_b3b4d9d9a073edd19acd8022f6"`);
        await queryRunner.query(`DROP TABLE "import_mapping_presets"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_063b950263be9f699e2185564f"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_8a3202f5466b0c3cc5e949e0f9"`);
        await queryRunner.query(`DROP TABLE "import_jobs"`);
    }

}
