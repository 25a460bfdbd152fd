CREATE TABLE "analysis_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"cases" integer NOT NULL,
	"input" jsonb NOT NULL,
	"result" jsonb,
	"problems" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "known_devices" (
	"token_hash" text NOT NULL,
	"user_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "known_devices_token_hash_user_id_pk" PRIMARY KEY("token_hash","user_id")
);
--> statement-breakpoint
CREATE TABLE "signing_requests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"session_id" uuid NOT NULL,
	"organisation_id" uuid NOT NULL,
	"case_id" uuid NOT NULL,
	"intent" text NOT NULL,
	"step" text,
	"report_id" uuid,
	"comment" text DEFAULT '' NOT NULL,
	"target_hash" text NOT NULL,
	"nonce_hash" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"completed_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "api_tokens" ADD COLUMN "scope" text DEFAULT 'read-write' NOT NULL;--> statement-breakpoint
-- Each organisation's entries become a chain of their own, numbered from 1 in the order written.
-- The hashes are recomputed to cover id and sequence by the start-up step that finds the marker
-- below (app/db/audit-rechain.server.ts): canonical JSON is computed in TypeScript, not SQL.
ALTER TABLE "audit_log" ADD COLUMN "seq" bigint;--> statement-breakpoint
ALTER TABLE "audit_log" DISABLE TRIGGER "audit_log_append_only";--> statement-breakpoint
UPDATE "audit_log" AS a SET "seq" = n.seq FROM (SELECT "id", row_number() OVER (PARTITION BY "organisation_id" ORDER BY "id") AS seq FROM "audit_log") AS n WHERE a."id" = n."id";--> statement-breakpoint
ALTER TABLE "audit_log" ENABLE TRIGGER "audit_log_append_only";--> statement-breakpoint
ALTER TABLE "audit_log" ALTER COLUMN "seq" SET NOT NULL;--> statement-breakpoint
CREATE TABLE "audit_rechain_pending" ("since" timestamp with time zone DEFAULT now() NOT NULL);--> statement-breakpoint
INSERT INTO "audit_rechain_pending" SELECT now() WHERE EXISTS (SELECT 1 FROM "audit_log");--> statement-breakpoint
ALTER TABLE "sign_in_attempts" ADD COLUMN "purpose" text DEFAULT 'sign-in' NOT NULL;--> statement-breakpoint
ALTER TABLE "sign_in_attempts" ADD COLUMN "device" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "analysis_jobs" ADD CONSTRAINT "analysis_jobs_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "analysis_jobs" ADD CONSTRAINT "analysis_jobs_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "known_devices" ADD CONSTRAINT "known_devices_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_requests" ADD CONSTRAINT "signing_requests_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_requests" ADD CONSTRAINT "signing_requests_session_id_sessions_id_fk" FOREIGN KEY ("session_id") REFERENCES "public"."sessions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_requests" ADD CONSTRAINT "signing_requests_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_requests" ADD CONSTRAINT "signing_requests_case_id_cases_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."cases"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "analysis_jobs_user_idx" ON "analysis_jobs" USING btree ("user_id","created_at");--> statement-breakpoint
CREATE INDEX "known_devices_user_idx" ON "known_devices" USING btree ("user_id");--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_chain_seq_key" UNIQUE NULLS NOT DISTINCT("organisation_id","seq");--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_issued_has_object" CHECK ("reports"."status" NOT IN ('issued', 'released') OR ("reports"."key" IS NOT NULL AND "reports"."sha256" IS NOT NULL AND "reports"."size" IS NOT NULL AND "reports"."issued_at" IS NOT NULL));--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_released_has_time" CHECK ("reports"."status" <> 'released' OR "reports"."released_at" IS NOT NULL);--> statement-breakpoint
-- An issued report takes one change only, its release; a released one none; neither is deleted.
CREATE FUNCTION reports_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status IN ('issued', 'released') THEN
      RAISE EXCEPTION 'reports: an % report is kept as it is (DELETE refused)', OLD.status;
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.status = 'released' THEN
    RAISE EXCEPTION 'reports: a released report is kept as it is (UPDATE refused)';
  END IF;
  IF OLD.status = 'issued' AND (NEW.status <> 'released' OR (to_jsonb(NEW) - 'status' - 'released_at') IS DISTINCT FROM (to_jsonb(OLD) - 'status' - 'released_at')) THEN
    RAISE EXCEPTION 'reports: an issued report may only be released, nothing else changed (UPDATE refused)';
  END IF;
  IF NEW.status = 'released' AND OLD.status <> 'issued' THEN
    RAISE EXCEPTION 'reports: only an issued report can be released (UPDATE refused)';
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER reports_append_only BEFORE UPDATE OR DELETE ON reports
  FOR EACH ROW EXECUTE FUNCTION reports_refuse_change();
