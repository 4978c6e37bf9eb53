ALTER TABLE "product_parts" ADD COLUMN "position" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
-- Existing bills keep the order they were shown in until now: by name, then largest first.
UPDATE "product_parts" SET "position" = ranked.n FROM (
  SELECT "id", row_number() OVER (PARTITION BY "product_id" ORDER BY "name", "length_um" DESC, "width_um" DESC) - 1 AS n FROM "product_parts"
) AS ranked WHERE ranked."id" = "product_parts"."id";
