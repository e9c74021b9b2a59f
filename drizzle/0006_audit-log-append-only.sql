-- Hand-written: keep the actor's e-mail on history written before the column existed, then make
-- the audit log append-only. One trigger function serves every refusal: an UPDATE or DELETE of a
-- row, and a TRUNCATE of the table. Dropping the table (a restore with --clean) is not a row change
-- and stays possible for the database owner.
UPDATE "audit_log" SET "actor_email" = "users"."email" FROM "users" WHERE "audit_log"."user_id" = "users"."id" AND "audit_log"."actor_email" IS NULL;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION "audit_log_refuse_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'audit_log is append-only: % refused', TG_OP USING ERRCODE = 'insufficient_privilege';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER "audit_log_append_only" BEFORE UPDATE OR DELETE ON "audit_log" FOR EACH ROW EXECUTE FUNCTION "audit_log_refuse_change"();
--> statement-breakpoint
CREATE TRIGGER "audit_log_no_truncate" BEFORE TRUNCATE ON "audit_log" FOR EACH STATEMENT EXECUTE FUNCTION "audit_log_refuse_change"();
