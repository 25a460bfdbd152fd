CREATE TABLE "result_inputs" (
	"case_id" uuid NOT NULL,
	"source" text NOT NULL,
	"engine_version" text NOT NULL,
	"input_hash" text NOT NULL,
	"case_count" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "result_inputs_case_id_source_engine_version_pk" PRIMARY KEY("case_id","source","engine_version")
);
--> statement-breakpoint
ALTER TABLE "result_inputs" ADD CONSTRAINT "result_inputs_case_id_cases_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."cases"("id") ON DELETE cascade ON UPDATE no action;