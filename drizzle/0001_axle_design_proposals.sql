CREATE TABLE "axle_design_proposals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"design_id" uuid NOT NULL,
	"base_revision" integer NOT NULL,
	"corner" jsonb NOT NULL,
	"message" text,
	"origin" jsonb,
	"status" text DEFAULT 'open' NOT NULL,
	"author_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"decided_by" uuid,
	"decided_at" timestamp with time zone,
	"decision_message" text,
	"accepted_revision" integer
);
--> statement-breakpoint
ALTER TABLE "axle_design_proposals" ADD CONSTRAINT "axle_design_proposals_design_id_axle_designs_id_fk" FOREIGN KEY ("design_id") REFERENCES "public"."axle_designs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "axle_design_proposals" ADD CONSTRAINT "axle_design_proposals_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "axle_design_proposals" ADD CONSTRAINT "axle_design_proposals_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "axle_design_proposals_design_idx" ON "axle_design_proposals" USING btree ("design_id");