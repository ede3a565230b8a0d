ALTER TABLE "indicator_settings" DROP COLUMN "min_tau";--> statement-breakpoint
-- Settings no engineer has edited move to the new starting values of the likelihood-ratio judgement
-- (shared/pipeline/indicatorDefaults.ts); edited rows keep what their engineer chose.
UPDATE "indicator_settings" AS s SET "trend_window_samples" = 1200, "evaluate_every" = 20, "alpha" = 0.01, "min_trend_samples" = 200,
  "detrend_bandwidth_s" = 50 * t."sample_period_s"
FROM "tags" AS t WHERE t."id" = s."tag_id" AND s."updated_by" IS NULL;
