CREATE TABLE "result_cases" (
	"result_id" uuid NOT NULL,
	"load_case" text NOT NULL,
	"ordinal" integer NOT NULL,
	"input" jsonb NOT NULL,
	"result" jsonb NOT NULL,
	CONSTRAINT "result_cases_result_id_load_case_pk" PRIMARY KEY("result_id","load_case")
);
--> statement-breakpoint
ALTER TABLE "case_results" ADD COLUMN "input_head" jsonb;--> statement-breakpoint
ALTER TABLE "result_cases" ADD CONSTRAINT "result_cases_result_id_case_results_id_fk" FOREIGN KEY ("result_id") REFERENCES "public"."case_results"("id") ON DELETE cascade ON UPDATE no action;