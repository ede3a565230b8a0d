-- The look α while a tag's trend window grows becomes 0.008; once it slides, the look spends a
-- false-alert budget per tag-day (shared/pipeline/indicatorDefaults.ts). Settings no engineer has
-- edited move to it; edited rows keep what their engineer chose.
UPDATE "indicator_settings" SET "alpha" = 0.008 WHERE "updated_by" IS NULL AND "version_id" IS NULL;
