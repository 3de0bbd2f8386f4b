ALTER TABLE "study_chunks" ALTER COLUMN "result" SET DATA TYPE json;--> statement-breakpoint
ALTER TABLE "study_chunks" ALTER COLUMN "result" SET STORAGE EXTERNAL;