ALTER TABLE "plans" ADD COLUMN "rack_credit_minor" integer;--> statement-breakpoint
-- Saved plans credit their offcuts at the material's cheapest sheet price per area (today's prices),
-- in the same floating-point steps as the plan runner (floor(x + 0.5) is JavaScript's Math.round).
UPDATE "plans" SET "rack_credit_minor" = least("cost_minor", coalesce((
  SELECT floor("plans"."offcut_area_mm2" * (min(sp."cost_minor"::float8 / (sp."length_um"::float8 * sp."width_um"::float8)) * 1e6) + 0.5)::int
  FROM "stock_panels" AS sp
  JOIN "batches" AS b ON b."material_id" = sp."material_id" AND b."shop_id" = sp."shop_id"
  WHERE b."id" = "plans"."batch_id"
), 0)) WHERE "result" IS NOT NULL AND "cost_minor" IS NOT NULL AND "offcut_area_mm2" IS NOT NULL;
