CREATE TABLE "rig_measurements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"team_id" uuid NOT NULL,
	"name" text NOT NULL,
	"file_name" text NOT NULL,
	"attached_to" text NOT NULL,
	"configuration_id" uuid,
	"configuration_revision" integer,
	"axle" text NOT NULL,
	"design_id" uuid NOT NULL,
	"design_revision" integer NOT NULL,
	"side" text DEFAULT 'left' NOT NULL,
	"rack_mm" double precision DEFAULT 0 NOT NULL,
	"basis" text DEFAULT 'change' NOT NULL,
	"mapping" jsonb NOT NULL,
	"points" jsonb NOT NULL,
	"point_count" integer NOT NULL,
	"has_camber" boolean NOT NULL,
	"note" text,
	"author_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "rig_measurements_attachment" CHECK (("rig_measurements"."attached_to" = 'configuration' AND "rig_measurements"."configuration_id" IS NOT NULL AND "rig_measurements"."configuration_revision" IS NOT NULL) OR ("rig_measurements"."attached_to" = 'baseline' AND "rig_measurements"."configuration_id" IS NULL))
);
--> statement-breakpoint
CREATE TABLE "team_rig_settings" (
	"team_id" uuid PRIMARY KEY NOT NULL,
	"toe_tolerance_deg" double precision NOT NULL,
	"camber_tolerance_deg" double precision NOT NULL,
	"updated_by" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "rig_measurements" ADD CONSTRAINT "rig_measurements_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rig_measurements" ADD CONSTRAINT "rig_measurements_configuration_id_configurations_id_fk" FOREIGN KEY ("configuration_id") REFERENCES "public"."configurations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rig_measurements" ADD CONSTRAINT "rig_measurements_design_id_axle_designs_id_fk" FOREIGN KEY ("design_id") REFERENCES "public"."axle_designs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rig_measurements" ADD CONSTRAINT "rig_measurements_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "team_rig_settings" ADD CONSTRAINT "team_rig_settings_team_id_teams_id_fk" FOREIGN KEY ("team_id") REFERENCES "public"."teams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "team_rig_settings" ADD CONSTRAINT "team_rig_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "rig_measurements_team_idx" ON "rig_measurements" USING btree ("team_id","created_at");--> statement-breakpoint
CREATE INDEX "rig_measurements_configuration_idx" ON "rig_measurements" USING btree ("configuration_id");--> statement-breakpoint
CREATE INDEX "rig_measurements_design_idx" ON "rig_measurements" USING btree ("design_id");