CREATE TABLE "outbox" (
	"id" serial PRIMARY KEY NOT NULL,
	"to" varchar(254) NOT NULL,
	"subject" varchar(300) NOT NULL,
	"text" text NOT NULL,
	"attachments" jsonb,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "failed_sign_ins" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "sign_in_blocked_until" timestamp with time zone;--> statement-breakpoint
CREATE INDEX "outbox_pending_idx" ON "outbox" USING btree ("next_attempt_at") WHERE "outbox"."sent_at" is null;