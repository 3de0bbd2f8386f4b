CREATE TABLE "caution_acknowledgements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"configuration_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"transition_id" uuid NOT NULL,
	"axle" text NOT NULL,
	"code" text NOT NULL,
	"message" text NOT NULL,
	"value" double precision,
	"threshold" double precision,
	"unit" text,
	"reason" text NOT NULL,
	"acknowledged_by" uuid,
	"acknowledged_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "rig_evidence_waivers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"configuration_id" uuid NOT NULL,
	"revision" integer NOT NULL,
	"transition_id" uuid NOT NULL,
	"axle" text NOT NULL,
	"reason" text NOT NULL,
	"waived_by" uuid,
	"waived_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "caution_acknowledgements" ADD CONSTRAINT "caution_acknowledgements_configuration_id_configurations_id_fk" FOREIGN KEY ("configuration_id") REFERENCES "public"."configurations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "caution_acknowledgements" ADD CONSTRAINT "caution_acknowledgements_transition_id_configuration_transitions_id_fk" FOREIGN KEY ("transition_id") REFERENCES "public"."configuration_transitions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "caution_acknowledgements" ADD CONSTRAINT "caution_acknowledgements_acknowledged_by_users_id_fk" FOREIGN KEY ("acknowledged_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rig_evidence_waivers" ADD CONSTRAINT "rig_evidence_waivers_configuration_id_configurations_id_fk" FOREIGN KEY ("configuration_id") REFERENCES "public"."configurations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rig_evidence_waivers" ADD CONSTRAINT "rig_evidence_waivers_transition_id_configuration_transitions_id_fk" FOREIGN KEY ("transition_id") REFERENCES "public"."configuration_transitions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rig_evidence_waivers" ADD CONSTRAINT "rig_evidence_waivers_waived_by_users_id_fk" FOREIGN KEY ("waived_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "caution_acknowledgements_configuration_idx" ON "caution_acknowledgements" USING btree ("configuration_id","revision");--> statement-breakpoint
CREATE INDEX "rig_evidence_waivers_configuration_idx" ON "rig_evidence_waivers" USING btree ("configuration_id","revision");