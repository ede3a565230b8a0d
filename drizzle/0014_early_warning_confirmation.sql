-- The trend test detrends its own window, a look while the window grows raises on its own at
-- α 0.004, and a sliding look is confirmed by the look before it inside the engine
-- (shared/pipeline/evaluateRecord.ts). Settings no engineer has edited move to the new α, and the
-- slowing-down rules the demo seeded lose their on-delay, which the engine now does itself; rows an
-- engineer edited keep what they chose.
UPDATE "indicator_settings" SET "alpha" = 0.004 WHERE "updated_by" IS NULL AND "version_id" IS NULL;
--> statement-breakpoint
UPDATE "alarm_rules" SET "on_delay_s" = 0 WHERE "measure" = 'early_warning' AND "updated_by" IS NULL;
