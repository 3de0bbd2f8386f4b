CREATE TABLE "compute_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"owner_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"state" text DEFAULT 'queued' NOT NULL,
	"progress_fraction" double precision DEFAULT 0 NOT NULL,
	"progress_message" text DEFAULT 'Waiting for a free worker' NOT NULL,
	"result_json" text,
	"error" jsonb,
	"gone_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "studies" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"team_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"label" text NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"request" jsonb NOT NULL,
	"target" jsonb NOT NULL,
	"spec" jsonb NOT NULL,
	"seed" integer NOT NULL,
	"total_chunks" integer NOT NULL,
	"total_samples" integer NOT NULL,
	"done_chunks" integer DEFAULT 0 NOT NULL,
	"done_samples" integer DEFAULT 0 NOT NULL,
	"compute_ms" double precision DEFAULT 0 NOT NULL,
	"poses_solved" double precision DEFAULT 0 NOT NULL,
	"result" jsonb,
	"error" jsonb,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	CONSTRAINT "studies_progress" CHECK ("studies"."done_chunks" >= 0 AND "studies"."done_chunks" <= "studies"."total_chunks")
);
--> statement-breakpoint
CREATE TABLE "study_chunks" (
	"study_id" uuid NOT NULL,
	"chunk_index" integer NOT NULL,
	"samples" integer NOT NULL,
	"poses" double precision NOT NULL,
	"result" jsonb NOT NULL,
	"compute_ms" double precision NOT NULL,
	"worker" text NOT NULL,
	"finished_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "study_chunks_study_id_chunk_index_pk" PRIMARY KEY("study_id","chunk_index")
);
--> statement-breakpoint
ALTER TABLE "compute_jobs" ADD CONSTRAINT "compute_jobs_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "studies" ADD CONSTRAINT "studies_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "study_chunks" ADD CONSTRAINT "study_chunks_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "compute_jobs_owner_idx" ON "compute_jobs" USING btree ("owner_id","state");--> statement-breakpoint
CREATE INDEX "compute_jobs_finished_idx" ON "compute_jobs" USING btree ("finished_at");--> statement-breakpoint
CREATE INDEX "studies_team_idx" ON "studies" USING btree ("team_id","created_at");--> statement-breakpoint
CREATE INDEX "studies_active_idx" ON "studies" USING btree ("team_id","status");