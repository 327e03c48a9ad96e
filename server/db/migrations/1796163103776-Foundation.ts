import { MigrationInterface, QueryRunner } from "typeorm";

export class Foundation1796163103776 implements MigrationInterface {
    name = 'Foundation1796163103776'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "sites" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "code" text NOT NULL, "name" text NOT NULL, "inclusion_criteria" text NOT NULL DEFAULT '', "exclusion_criteria" text NOT NULL DEFAULT '', "active" boolean NOT NULL DEFAULT true, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_dde6621eadc0c9c9621360ec668" UNIQUE ("code"), CONSTRAINT "PK_4f5eccb1dfde10c9170502595a7" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "units" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "site_id" uuid NOT NULL, "code" text NOT NULL, "name" text NOT NULL, "kind" text NOT NULL DEFAULT 'ward', "active" boolean NOT NULL DEFAULT true, CONSTRAINT "PK_5a8f2f064919b587d93936cb223" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_bb37dec0abc9c1aa03f7285ce6" ON "units"  ("site_id", "code") `);
        await queryRunner.query(`CREATE TABLE "users" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "email" text NOT NULL, "display_name" text NOT NULL, "password_hash" text, "roles" text array NOT NULL DEFAULT '{}', "is_chair" boolean NOT NULL DEFAULT false, "active" boolean NOT NULL DEFAULT true, "totp_secret" text, "totp_enabled" boolean NOT NULL DEFAULT false, "failed_attempts" integer NOT NULL DEFAULT '0', "locked_until" TIMESTAMP WITH TIME ZONE, "last_login_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_97672ac88f789774dd47f7c8be3" UNIQUE ("email"), CONSTRAINT "PK_a3ffb1c0c8416b9fc6f907b7433" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "user_sites" ("user_id" uuid NOT NULL, "site_id" uuid NOT NULL, CONSTRAINT "PK_fb40cfe04628e6adefbe90c1eb4" PRIMARY KEY ("user_id", "site_id"))`);
        await queryRunner.query(`CREATE TABLE "auth_tokens" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "user_id" uuid NOT NULL, "kind" text NOT NULL, "token_hash" text NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "used_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_41e9ddfbb32da18c4e85e45c2fd" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_3a94cfa1eada85ac2bf6f3016b" ON "auth_tokens"  ("token_hash") `);
        await queryRunner.query(`CREATE TABLE "audit_entries" ("id" BIGSERIAL NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "actor_id" uuid, "actor_email" text, "action" text NOT NULL, "entity" text, "entity_id" text, "field" text, "old_value" text, "new_value" text, "reason" text, "ip" text, "details" jsonb, CONSTRAINT "PK_6b1623bcad4d04530b76548d619" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_b12f87335630edfd1294cf349b" ON "audit_entries"  ("at") `);
        await queryRunner.query(`CREATE INDEX "IDX_fa5168a1898ada227a983fae82" ON "audit_entries"  ("entity", "entity_id") `);
        await queryRunner.query(`CREATE TABLE "mail_messages" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "received_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "mail_from" text NOT NULL, "mail_to" text array NOT NULL, "subject" text NOT NULL, "body" text NOT NULL, CONSTRAINT "PK_1bd6e76ef3b3d4aff7d0510a509" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "settings" ("key" text NOT NULL, "value" jsonb NOT NULL, CONSTRAINT "PK_c8639b7626fa94ba8265628f214" PRIMARY KEY ("key"))`);
        await queryRunner.query(`CREATE TABLE "jobs" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "kind" text NOT NULL, "status" text NOT NULL DEFAULT 'queued', "payload" jsonb NOT NULL DEFAULT '{}', "progress" jsonb NOT NULL DEFAULT '{}', "result" jsonb, "error" text, "attempts" integer NOT NULL DEFAULT '0', "cancel_requested" boolean NOT NULL DEFAULT false, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "started_at" TIMESTAMP WITH TIME ZONE, "finished_at" TIMESTAMP WITH TIME ZONE, "heartbeat_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "PK_cf0a6c42b72fcc7f7c237def345" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_c2130d1d7e7f4408202a36e4f1" ON "jobs"  ("status", "created_at") `);
        await queryRunner.query(`ALTER TABLE "units" ADD CONSTRAINT "FK_2e1f4c47dcaa5ff0cb28211963b" FOREIGN KEY ("site_id") REFERENCES "sites"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "user_sites" ADD CONSTRAINT "FK_876af02663eefdbbd607c736346" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "user_sites" ADD CONSTRAINT "FK_76a7e1a212a3784b96140b713ba" FOREIGN KEY ("site_id") REFERENCES "sites"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        // Sessions (connect-pg-simple's table.sql: the store does not create it by itself).
        await queryRunner.query(`CREATE TABLE "session" ("sid" varchar NOT NULL COLLATE "default", "sess" json NOT NULL, "expire" timestamp(6) NOT NULL, CONSTRAINT "session_pkey" PRIMARY KEY ("sid"))`);
        await queryRunner.query(`CREATE INDEX "IDX_session_expire" ON "session" ("expire")`);
        // History cannot be rewritten: refuse UPDATE, DELETE and TRUNCATE on the audit table for every role.
        await queryRunner.query(`CREATE FUNCTION audit_entries_append_only() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RAISE EXCEPTION 'audit_entries is append-only (% refused)', TG_OP USING ERRCODE = 'insufficient_privilege'; END $$`);
        await queryRunner.query(`CREATE TRIGGER audit_entries_no_update BEFORE UPDATE OR DELETE ON "audit_entries" FOR EACH ROW EXECUTE FUNCTION audit_entries_append_only()`);
        await queryRunner.query(`CREATE TRIGGER audit_entries_no_truncate BEFORE TRUNCATE ON "audit_entries" FOR EACH STATEMENT EXECUTE FUNCTION audit_entries_append_only()`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TABLE "session"`);
        await queryRunner.query(`DROP TRIGGER audit_entries_no_truncate ON "audit_entries"`);
        await queryRunner.query(`DROP TRIGGER audit_entries_no_update ON "audit_entries"`);
        await queryRunner.query(`DROP FUNCTION audit_entries_append_only()`);
        await queryRunner.query(`ALTER TABLE "user_sites" DROP CONSTRAINT "FK_76a7e1a212a3784b96140b713ba"`);
        await queryRunner.query(`ALTER TABLE "user_sites" DROP CONSTRAINT "FK_876af02663eefdbbd607c736346"`);
        await queryRunner.query(`ALTER TABLE "units" DROP CONSTRAINT "FK_2e1f4c47dcaa5ff0cb28211963b"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c2130d1d7e7f4408202a36e4f1"`);
        await queryRunner.query(`DROP TABLE "jobs"`);
        await queryRunner.query(`DROP TABLE "settings"`);
        await queryRunner.query(`DROP TABLE "mail_messages"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_fa5168a1898ada227a983fae82"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_b12f87335630edfd1294cf349b"`);
        await queryRunner.query(`DROP TABLE "audit_entries"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_3a94cfa1eada85ac2bf6f3016b"`);
        await queryRunner.query(`DROP TABLE "auth_tokens"`);
        await queryRunner.query(`DROP TABLE "user_sites"`);
        await queryRunner.query(`DROP TABLE "users"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_bb37dec0abc9c1aa03f7285ce6"`);
        await queryRunner.query(`DROP TABLE "units"`);
        await queryRunner.query(`DROP TABLE "sites"`);
    }

}
