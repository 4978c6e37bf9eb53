CREATE TABLE "kerf_measurements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"saw_id" uuid NOT NULL,
	"kerf_um" integer NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"measured_by" text,
	"measured_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "recut_parts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"material_id" uuid NOT NULL,
	"spoiled_in_batch_id" uuid NOT NULL,
	"batch_id" uuid,
	"part_name" text NOT NULL,
	"length_um" integer NOT NULL,
	"width_um" integer NOT NULL,
	"grain_locked" boolean NOT NULL,
	"process" "part_process" NOT NULL,
	"reason" text NOT NULL,
	"origin" jsonb,
	"recorded_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "saws" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"name" text NOT NULL,
	"blade" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "setup_ticks" (
	"batch_id" uuid NOT NULL,
	"setup_index" integer NOT NULL,
	"count_cut" integer NOT NULL,
	"ticked_by" text,
	"ticked_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sled_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"sled_id" uuid NOT NULL,
	"width_first_end_um" integer NOT NULL,
	"width_second_end_um" integer NOT NULL,
	"strip_length_um" integer NOT NULL,
	"pivot_distance_um" integer NOT NULL,
	"checked_by" text,
	"checked_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sleds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"shop_id" uuid NOT NULL,
	"saw_id" uuid,
	"name" text NOT NULL,
	"stop_min_um" integer NOT NULL,
	"stop_max_um" integer NOT NULL,
	"widest_um" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batches" ADD COLUMN "cut_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "shops" ADD COLUMN "sled_tolerance_um_per_m" integer DEFAULT 150 NOT NULL;--> statement-breakpoint
ALTER TABLE "kerf_measurements" ADD CONSTRAINT "kerf_measurements_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "kerf_measurements" ADD CONSTRAINT "kerf_measurements_saw_id_saws_id_fk" FOREIGN KEY ("saw_id") REFERENCES "public"."saws"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "kerf_measurements" ADD CONSTRAINT "kerf_measurements_measured_by_users_id_fk" FOREIGN KEY ("measured_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recut_parts" ADD CONSTRAINT "recut_parts_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recut_parts" ADD CONSTRAINT "recut_parts_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recut_parts" ADD CONSTRAINT "recut_parts_spoiled_in_batch_id_batches_id_fk" FOREIGN KEY ("spoiled_in_batch_id") REFERENCES "public"."batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recut_parts" ADD CONSTRAINT "recut_parts_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recut_parts" ADD CONSTRAINT "recut_parts_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "saws" ADD CONSTRAINT "saws_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "setup_ticks" ADD CONSTRAINT "setup_ticks_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "setup_ticks" ADD CONSTRAINT "setup_ticks_ticked_by_users_id_fk" FOREIGN KEY ("ticked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sled_checks" ADD CONSTRAINT "sled_checks_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sled_checks" ADD CONSTRAINT "sled_checks_sled_id_sleds_id_fk" FOREIGN KEY ("sled_id") REFERENCES "public"."sleds"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sled_checks" ADD CONSTRAINT "sled_checks_checked_by_users_id_fk" FOREIGN KEY ("checked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sleds" ADD CONSTRAINT "sleds_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sleds" ADD CONSTRAINT "sleds_saw_id_saws_id_fk" FOREIGN KEY ("saw_id") REFERENCES "public"."saws"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "kerf_measurements_saw_idx" ON "kerf_measurements" USING btree ("saw_id","measured_at");--> statement-breakpoint
CREATE INDEX "recut_parts_open_idx" ON "recut_parts" USING btree ("shop_id","material_id","batch_id");--> statement-breakpoint
CREATE UNIQUE INDEX "setup_ticks_batch_setup_key" ON "setup_ticks" USING btree ("batch_id","setup_index");--> statement-breakpoint
CREATE INDEX "sled_checks_sled_idx" ON "sled_checks" USING btree ("sled_id","checked_at");