ALTER TABLE "plans" ADD COLUMN "sheet_sizes" jsonb;--> statement-breakpoint
-- Finished plans count their stock panels by size, from the stock each saved panel names.
UPDATE "plans" SET "sheet_sizes" = coalesce((
  SELECT jsonb_agg(jsonb_build_object('lengthUm', g.l, 'widthUm', g.w, 'count', g.n) ORDER BY g.l::bigint * g.w DESC, g.l DESC, g.w DESC)
  FROM (
    SELECT ("result"->'stockRefs'->(sheet->>'stockId')->>'lengthUm')::int AS l,
           ("result"->'stockRefs'->(sheet->>'stockId')->>'widthUm')::int AS w,
           count(*)::int AS n
    FROM jsonb_array_elements("result"->'plan'->'sheets') AS sheet
    WHERE "result"->'stockRefs'->(sheet->>'stockId')->>'kind' = 'panel'
    GROUP BY 1, 2
  ) AS g
), '[]'::jsonb) WHERE "result" IS NOT NULL;
