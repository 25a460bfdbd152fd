CREATE TABLE "result_progress" (
	"case_id" uuid NOT NULL,
	"input_hash" text NOT NULL,
	"engine_version" text NOT NULL,
	"phase" text DEFAULT 'queued' NOT NULL,
	"solves" integer DEFAULT 0 NOT NULL,
	"cases_done" integer DEFAULT 0 NOT NULL,
	"cases_total" integer NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "result_progress_case_id_input_hash_engine_version_pk" PRIMARY KEY("case_id","input_hash","engine_version")
);
--> statement-breakpoint
ALTER TABLE "result_progress" ADD CONSTRAINT "result_progress_case_id_cases_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."cases"("id") ON DELETE cascade ON UPDATE no action;