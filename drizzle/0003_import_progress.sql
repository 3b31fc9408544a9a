ALTER TABLE "import_runs" ALTER COLUMN "status" SET DEFAULT 'queued';--> statement-breakpoint
ALTER TABLE "import_runs" ADD COLUMN "progress_stage" varchar(20);--> statement-breakpoint
ALTER TABLE "import_runs" ADD COLUMN "progress_done" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "import_runs" ADD COLUMN "progress_total" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "import_runs" ADD COLUMN "error" text;--> statement-breakpoint
ALTER TABLE "projects" ADD COLUMN "content_hash" varchar(64);