CREATE TABLE "rule_sensitivities" (
	"case_id" uuid NOT NULL,
	"input_hash" text NOT NULL,
	"engine_version" text NOT NULL,
	"phase" text DEFAULT 'queued' NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"total" integer DEFAULT 0 NOT NULL,
	"sensitivity" jsonb,
	"problem" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "rule_sensitivities_case_id_input_hash_engine_version_pk" PRIMARY KEY("case_id","input_hash","engine_version")
);
--> statement-breakpoint
ALTER TABLE "rule_sensitivities" ADD CONSTRAINT "rule_sensitivities_case_id_cases_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."cases"("id") ON DELETE cascade ON UPDATE no action;