ALTER TABLE "study_chunks" ADD COLUMN "outputs" "bytea";--> statement-breakpoint
ALTER TABLE "study_chunks" ALTER COLUMN "outputs" SET STORAGE EXTERNAL;