CREATE TYPE "public"."brace_configuration" AS ENUM('single_diagonal', 'inverted_v', 'v', 'two_story_x');--> statement-breakpoint
CREATE TYPE "public"."design_method" AS ENUM('lrfd', 'asd');--> statement-breakpoint
CREATE TYPE "public"."value_phase" AS ENUM('sd', 'dd', 'cd', 'submittal', 'approved', 'coupon');--> statement-breakpoint
CREATE TYPE "public"."tonnage_category" AS ENUM('braces', 'beams', 'columns', 'connections', 'lateral_total', 'structural_total');--> statement-breakpoint
CREATE TYPE "public"."tonnage_stage" AS ENUM('preliminary', 'final');--> statement-breakpoint
CREATE TYPE "public"."yield_basis" AS ENUM('specified_min', 'yield_range', 'mill_cert', 'coupon');--> statement-breakpoint
CREATE TABLE "brace_snapshots" (
	"id" serial PRIMARY KEY NOT NULL,
	"brace_id" integer NOT NULL,
	"phase" "value_phase" NOT NULL,
	"revision" smallint DEFAULT 0 NOT NULL,
	"date" date,
	"source_document" varchar(200),
	"required_core_area_in2" double precision,
	"core_area_in2" double precision,
	"fysc_ksi" double precision,
	"fysc_basis" "yield_basis",
	"fysc_max_ksi" double precision,
	"ry" double precision,
	"beta" double precision,
	"omega" double precision,
	"factor_drift_multiple" double precision,
	"stiffness_factor" double precision,
	"yield_length_ratio" double precision,
	"adjusted_tension_kip" double precision,
	"adjusted_compression_kip" double precision,
	"governing" boolean DEFAULT false NOT NULL,
	"confirmed" boolean DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE TABLE "braces" (
	"id" serial PRIMARY KEY NOT NULL,
	"level_id" integer NOT NULL,
	"brace_count" smallint NOT NULL,
	"angle_deg" double precision NOT NULL,
	"work_point_length_in" double precision NOT NULL,
	"required_strength_kip" double precision NOT NULL,
	"method" "design_method" DEFAULT 'lrfd' NOT NULL
);
--> statement-breakpoint
CREATE TABLE "frames" (
	"id" serial PRIMARY KEY NOT NULL,
	"project_id" integer NOT NULL,
	"frame_line" varchar(40) NOT NULL,
	"configuration" "brace_configuration" NOT NULL,
	"bays" smallint DEFAULT 1 NOT NULL,
	"bay_width_in" double precision NOT NULL
);
--> statement-breakpoint
CREATE TABLE "import_problems" (
	"id" serial PRIMARY KEY NOT NULL,
	"run_id" integer NOT NULL,
	"project_code" varchar(40),
	"severity" varchar(10) NOT NULL,
	"file" varchar(260) NOT NULL,
	"sheet" varchar(60),
	"row" integer,
	"column" varchar(80),
	"value" text,
	"message" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "import_runs" (
	"id" serial PRIMARY KEY NOT NULL,
	"user_id" integer,
	"source" varchar(20) NOT NULL,
	"file_name" varchar(260) NOT NULL,
	"sha256" varchar(64) NOT NULL,
	"status" varchar(20) DEFAULT 'running' NOT NULL,
	"dry_run" boolean DEFAULT false NOT NULL,
	"loaded" integer DEFAULT 0 NOT NULL,
	"updated" integer DEFAULT 0 NOT NULL,
	"unchanged" integer DEFAULT 0 NOT NULL,
	"rejected" integer DEFAULT 0 NOT NULL,
	"queued" integer DEFAULT 0 NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"original_base64" text
);
--> statement-breakpoint
CREATE TABLE "levels" (
	"id" serial PRIMARY KEY NOT NULL,
	"frame_id" integer NOT NULL,
	"name" varchar(40) NOT NULL,
	"level_index" smallint NOT NULL,
	"story_height_in" double precision NOT NULL,
	"story_shear_kip" double precision NOT NULL,
	"design_drift_in" double precision
);
--> statement-breakpoint
CREATE TABLE "projects" (
	"id" serial PRIMARY KEY NOT NULL,
	"code" varchar(40) NOT NULL,
	"name" varchar(200) NOT NULL,
	"client" varchar(200),
	"client_confidential" boolean DEFAULT true NOT NULL,
	"benchmark_permitted" boolean DEFAULT false NOT NULL,
	"office" varchar(80),
	"region" varchar(80),
	"building_use" varchar(40),
	"risk_category" varchar(4),
	"importance_factor" double precision,
	"sdc" varchar(1),
	"sds_g" double precision,
	"sd1_g" double precision,
	"site_class" varchar(2),
	"stories" smallint,
	"height_ft" double precision,
	"floor_area_ft2" double precision,
	"asce7_edition" varchar(10),
	"aisc341_edition" varchar(10),
	"analysis_method" varchar(10),
	"r" double precision,
	"cd" double precision,
	"omega0" double precision,
	"supplier_id" integer,
	"year_designed" smallint,
	"year_completed" smallint,
	"phase_reached" varchar(20),
	"draft" boolean DEFAULT false NOT NULL,
	"import_run_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "review_items" (
	"id" serial PRIMARY KEY NOT NULL,
	"run_id" integer,
	"snapshot_id" integer,
	"project_code" varchar(40) NOT NULL,
	"field" varchar(80) NOT NULL,
	"value" text,
	"reason" text NOT NULL,
	"status" varchar(12) DEFAULT 'open' NOT NULL,
	"resolution" jsonb,
	"resolved_by" integer,
	"resolved_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "suppliers" (
	"id" serial PRIMARY KEY NOT NULL,
	"code" varchar(40) NOT NULL,
	"display_name" varchar(120) NOT NULL,
	"notes" text,
	CONSTRAINT "suppliers_code_unique" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "tonnage" (
	"id" serial PRIMARY KEY NOT NULL,
	"project_id" integer NOT NULL,
	"stage" "tonnage_stage" NOT NULL,
	"category" "tonnage_category" NOT NULL,
	"tons_short" double precision NOT NULL,
	"scope" varchar(200)
);
--> statement-breakpoint
ALTER TABLE "brace_snapshots" ADD CONSTRAINT "brace_snapshots_brace_id_braces_id_fk" FOREIGN KEY ("brace_id") REFERENCES "public"."braces"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "braces" ADD CONSTRAINT "braces_level_id_levels_id_fk" FOREIGN KEY ("level_id") REFERENCES "public"."levels"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "frames" ADD CONSTRAINT "frames_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_problems" ADD CONSTRAINT "import_problems_run_id_import_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."import_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_runs" ADD CONSTRAINT "import_runs_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "levels" ADD CONSTRAINT "levels_frame_id_frames_id_fk" FOREIGN KEY ("frame_id") REFERENCES "public"."frames"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "projects" ADD CONSTRAINT "projects_supplier_id_suppliers_id_fk" FOREIGN KEY ("supplier_id") REFERENCES "public"."suppliers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_items" ADD CONSTRAINT "review_items_run_id_import_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."import_runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_items" ADD CONSTRAINT "review_items_snapshot_id_brace_snapshots_id_fk" FOREIGN KEY ("snapshot_id") REFERENCES "public"."brace_snapshots"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_items" ADD CONSTRAINT "review_items_resolved_by_users_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tonnage" ADD CONSTRAINT "tonnage_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "brace_snapshots_key" ON "brace_snapshots" USING btree ("brace_id","phase","revision");--> statement-breakpoint
CREATE INDEX "brace_snapshots_phase_idx" ON "brace_snapshots" USING btree ("phase");--> statement-breakpoint
CREATE UNIQUE INDEX "braces_level_key" ON "braces" USING btree ("level_id");--> statement-breakpoint
CREATE UNIQUE INDEX "frames_project_line_key" ON "frames" USING btree ("project_id","frame_line");--> statement-breakpoint
CREATE INDEX "import_problems_run_idx" ON "import_problems" USING btree ("run_id");--> statement-breakpoint
CREATE UNIQUE INDEX "levels_frame_name_key" ON "levels" USING btree ("frame_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "projects_code_key" ON "projects" USING btree ("code");--> statement-breakpoint
CREATE INDEX "review_items_status_idx" ON "review_items" USING btree ("status");--> statement-breakpoint
CREATE UNIQUE INDEX "tonnage_key" ON "tonnage" USING btree ("project_id","stage","category");