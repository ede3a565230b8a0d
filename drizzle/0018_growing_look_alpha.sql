-- A look while the trend window grows is now tested at α 0.0025 instead of 0.004: scored on
-- records up to 900 samples (not only 500), the alert's false positives on trend-free records grew
-- with the record's length and passed 5 % on several null kinds by 900 samples at 0.004
-- (scripts/calibrateEarlyWarning.ts SAMPLES=900; numbers beside ALPHA in
-- shared/pipeline/indicatorDefaults.ts). Settings no engineer has edited move; edited rows keep
-- what they chose.
UPDATE "indicator_settings" SET "alpha" = 0.0025 WHERE "updated_by" IS NULL AND "version_id" IS NULL AND "alpha" = 0.004;
