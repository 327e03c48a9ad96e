import { MigrationInterface, QueryRunner } from "typeorm";

export class Exports1796164118550 implements MigrationInterface {
    name = 'Exports1796164118550'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "export_requests" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "requester_id" uuid NOT NULL, "purpose" text NOT NULL, "cohort" jsonb NOT NULL DEFAULT '{}', "kind" text NOT NULL DEFAULT 'rows', "fields" text array NOT NULL DEFAULT '{}', "rows_by" text, "cols_by" text, "format" text NOT NULL, "level" text NOT NULL, "dua_reference" text, "dua_expires_on" date, "site_names_requested" boolean NOT NULL DEFAULT false, "status" text NOT NULL DEFAULT 'pending', "decided_by" uuid, "decided_at" TIMESTAMP WITH TIME ZONE, "decision_reason" text, "site_names_approved" boolean NOT NULL DEFAULT false, "risk_action" text NOT NULL DEFAULT 'none', "risk" jsonb, "job_id" uuid, "file_path" text, "file_name" text, "file_bytes" bigint, "file_sha256" text, "row_count" integer, "sheet_count" integer, "generated_at" TIMESTAMP WITH TIME ZONE, "expires_at" TIMESTAMP WITH TIME ZONE, "deleted_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_c1447734294baee42649c066afe" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_08729ba8693095e9d187519776" ON "export_requests"  ("status", "expires_at") `);
        await queryRunner.query(`CREATE INDEX "IDX_cfa5db6249bde1ac772427b690" ON "export_requests"  ("requester_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "export_downloads" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "request_id" uuid NOT NULL, "user_id" uuid NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "ip" text, CONSTRAINT "PK_27178cecb9cf51e685b194cfb62" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_0dda9bff25e2b3e9e77315d1b1" ON "export_downloads"  ("request_id") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_0dda9bff25e2b3e9e77315d1b1"`);
        await queryRunner.query(`DROP TABLE "export_downloads"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_cfa5db6249bde1ac772427b690"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_08729ba8693095e9d187519776"`);
        await queryRunner.query(`DROP TABLE "export_requests"`);
    }

}
