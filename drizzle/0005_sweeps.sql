CREATE TABLE "sweep_chunks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"sweep_id" uuid NOT NULL,
	"start" integer NOT NULL,
	"count" integer NOT NULL,
	"rows" jsonb NOT NULL,
	"errors" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sweep_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"team_id" uuid NOT NULL,
	"study_id" uuid NOT NULL,
	"revision_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"case_id" text,
	"case_name" text,
	"parameters" jsonb NOT NULL,
	"outputs" jsonb NOT NULL,
	"total" integer NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"error" text,
	"created_by" text NOT NULL,
	"claims" integer DEFAULT 0 NOT NULL,
	"runner" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "sweep_chunks" ADD CONSTRAINT "sweep_chunks_sweep_id_sweep_jobs_id_fk" FOREIGN KEY ("sweep_id") REFERENCES "public"."sweep_jobs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweep_jobs" ADD CONSTRAINT "sweep_jobs_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweep_jobs" ADD CONSTRAINT "sweep_jobs_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweep_jobs" ADD CONSTRAINT "sweep_jobs_revision_id_study_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."study_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sweep_jobs" ADD CONSTRAINT "sweep_jobs_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "sweep_chunks_start_idx" ON "sweep_chunks" USING btree ("sweep_id","start");--> statement-breakpoint
CREATE INDEX "sweep_jobs_study_idx" ON "sweep_jobs" USING btree ("study_id","created_at");--> statement-breakpoint
CREATE INDEX "sweep_jobs_status_idx" ON "sweep_jobs" USING btree ("status","team_id");