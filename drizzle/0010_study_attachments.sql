CREATE TABLE "study_attachments" (
	"study_id" uuid NOT NULL,
	"configuration_id" uuid NOT NULL,
	"team_id" uuid NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"attached_by" uuid,
	"attached_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "study_attachments_study_id_configuration_id_pk" PRIMARY KEY("study_id","configuration_id")
);
--> statement-breakpoint
ALTER TABLE "study_attachments" ADD CONSTRAINT "study_attachments_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "study_attachments" ADD CONSTRAINT "study_attachments_configuration_id_configurations_id_fk" FOREIGN KEY ("configuration_id") REFERENCES "public"."configurations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "study_attachments" ADD CONSTRAINT "study_attachments_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "study_attachments" ADD CONSTRAINT "study_attachments_attached_by_users_id_fk" FOREIGN KEY ("attached_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "study_attachments_configuration_idx" ON "study_attachments" USING btree ("configuration_id","attached_at");--> statement-breakpoint
CREATE INDEX "study_attachments_team_idx" ON "study_attachments" USING btree ("team_id","attached_at");