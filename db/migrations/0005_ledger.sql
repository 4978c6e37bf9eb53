CREATE TABLE "batch_costs" (
	"batch_id" uuid PRIMARY KEY NOT NULL,
	"shop_id" uuid NOT NULL,
	"material_id" uuid NOT NULL,
	"cut_at" timestamp with time zone NOT NULL,
	"stock_area_mm2" bigint NOT NULL,
	"offcut_drawn_area_mm2" bigint NOT NULL,
	"parts_area_mm2" bigint NOT NULL,
	"kerf_loss_mm2" bigint NOT NULL,
	"racked_area_mm2" bigint NOT NULL,
	"scrap_area_mm2" bigint NOT NULL,
	"spoiled_area_mm2" bigint NOT NULL,
	"spoiled_count" integer NOT NULL,
	"cost_drawn_minor" bigint NOT NULL,
	"value_returned_minor" bigint NOT NULL,
	"scrap_cost_minor" bigint NOT NULL,
	"spoiled_cost_minor" bigint NOT NULL,
	"panels" jsonb NOT NULL,
	"allocations" jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "batch_costs" ADD CONSTRAINT "batch_costs_batch_id_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_costs" ADD CONSTRAINT "batch_costs_shop_id_shops_id_fk" FOREIGN KEY ("shop_id") REFERENCES "public"."shops"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "batch_costs" ADD CONSTRAINT "batch_costs_material_id_materials_id_fk" FOREIGN KEY ("material_id") REFERENCES "public"."materials"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "batch_costs_shop_cut_idx" ON "batch_costs" USING btree ("shop_id","cut_at");