CREATE TYPE "public"."batch_status" AS ENUM('open', 'planned', 'released', 'cut', 'closed');--> statement-breakpoint
CREATE TYPE "public"."plan_status" AS ENUM('queued', 'running', 'done', 'failed', 'cancelled');--> statement-breakpoint
ALTER TYPE "public"."offcut_status" ADD VALUE 'expected' BEFORE 'racked';--> statement-breakpoint
CREATE TABLE "batch_lines" (
	"batch_id" uuid NOT NULL,
	"order_line_id" uuid NOT NULL,
	"material_id" uuid NOT NULL
);
--> statement-breakpoint
CREATE TABLE "batches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"material_id" uuid NOT NULL,
	"status" "batch_status" DEFAULT 'open' NOT NULL,
	"due_by" date NOT NULL,
	"chosen_plan_id" uuid,
	"released_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "held_lines" (
	"shop_id" uuid NOT NULL,
	"order_line_id" uuid NOT NULL,
	"material_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "plans" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"batch_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"status" "plan_status" DEFAULT 'queued' NOT NULL,
	"settings" jsonb NOT NULL,
	"progress" jsonb,
	"result" jsonb,
	"sheets" integer,
	"yield_permille" integer,
	"cost_minor" integer,
	"setups" integer,
	"offcut_area_mm2" integer,
	"error" text,
	"job_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "offcuts" ADD COLUMN "source_batch_id" uuid;--> statement-breakpoint
ALTER TABLE "offcuts" ADD COLUMN "reserved_batch_id" uuid;--> statement-breakpoint
ALTER TABLE "batch_lines" ADD CONSTRAINT "batch_lines_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_lines" ADD CONSTRAINT "batch_lines_order_line_id_order_lines_id_fk" FOREIGN KEY ("order_line_id") REFERENCES "public"."order_lines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_lines" ADD CONSTRAINT "batch_lines_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "held_lines" ADD CONSTRAINT "held_lines_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "held_lines" ADD CONSTRAINT "held_lines_order_line_id_order_lines_id_fk" FOREIGN KEY ("order_line_id") REFERENCES "public"."order_lines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "held_lines" ADD CONSTRAINT "held_lines_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plans" ADD CONSTRAINT "plans_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "plans" ADD CONSTRAINT "plans_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "batch_lines_line_material_key" ON "batch_lines" USING btree ("order_line_id","material_id");--> statement-breakpoint
CREATE INDEX "batch_lines_batch_idx" ON "batch_lines" USING btree ("batch_id");--> statement-breakpoint
CREATE UNIQUE INDEX "batches_shop_number_key" ON "batches" USING btree ("shop_id","number");--> statement-breakpoint
CREATE INDEX "batches_shop_status_idx" ON "batches" USING btree ("shop_id","status");--> statement-breakpoint
CREATE UNIQUE INDEX "held_lines_line_material_key" ON "held_lines" USING btree ("order_line_id","material_id");--> statement-breakpoint
CREATE UNIQUE INDEX "plans_batch_number_key" ON "plans" USING btree ("batch_id","number");