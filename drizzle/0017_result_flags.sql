CREATE TABLE "result_flags" (
	"result_id" uuid NOT NULL,
	"rank" integer NOT NULL,
	"load_case" text NOT NULL,
	"kinds" text[] NOT NULL,
	"facts" jsonb NOT NULL,
	CONSTRAINT "result_flags_result_id_rank_pk" PRIMARY KEY("result_id","rank")
);
--> statement-breakpoint
ALTER TABLE "result_flags" ADD CONSTRAINT "result_flags_result_id_case_results_id_fk" FOREIGN KEY ("result_id") REFERENCES "public"."case_results"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "result_flags_case_idx" ON "result_flags" USING btree ("result_id","load_case");