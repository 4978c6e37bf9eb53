ALTER TABLE "plans" ADD COLUMN "offcuts_used" integer;--> statement-breakpoint
-- Finished plans count their racked offcuts from the stock each saved panel names.
UPDATE "plans" SET "offcuts_used" = (
  SELECT count(*) FROM jsonb_array_elements("result"->'plan'->'sheets') AS sheet
  WHERE "result"->'stockRefs'->(sheet->>'stockId')->>'kind' = 'offcut'
) WHERE "result" IS NOT NULL;
