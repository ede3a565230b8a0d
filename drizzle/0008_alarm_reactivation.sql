ALTER TABLE "notification_outbox" DROP CONSTRAINT "notification_outbox_kind";--> statement-breakpoint
ALTER TABLE "alarm_events" ADD COLUMN "context" jsonb;--> statement-breakpoint
ALTER TABLE "alarms" ADD COLUMN "activated_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "alarms" ADD COLUMN "activated_value" double precision;--> statement-breakpoint
ALTER TABLE "alarms" ADD COLUMN "activation_count" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
-- Occurrences already stored: their latest activation is their newest 'activate' event (the raise when none).
UPDATE "alarms" a SET
  "activated_at" = coalesce((SELECT e."condition_time" FROM "alarm_events" e WHERE e."alarm_id" = a."id" AND e."event" = 'activate' AND e."condition_time" IS NOT NULL ORDER BY e."id" DESC LIMIT 1), a."raised_at"),
  "activated_value" = coalesce((SELECT e."value" FROM "alarm_events" e WHERE e."alarm_id" = a."id" AND e."event" = 'activate' ORDER BY e."id" DESC LIMIT 1), a."raised_value"),
  "activation_count" = greatest(1, (SELECT count(*) FROM "alarm_events" e WHERE e."alarm_id" = a."id" AND e."event" = 'activate'));--> statement-breakpoint
ALTER TABLE "alarms" ALTER COLUMN "activated_at" SET NOT NULL;--> statement-breakpoint
CREATE INDEX "alarms_site_activated" ON "alarms" USING btree ("site_id","activated_at");--> statement-breakpoint
CREATE UNIQUE INDEX "notification_outbox_open_history_summary" ON "notification_outbox" USING btree ("site_id") WHERE "notification_outbox"."kind" = 'history_summary' and "notification_outbox"."status" = 'pending';--> statement-breakpoint
ALTER TABLE "notification_outbox" ADD CONSTRAINT "notification_outbox_kind" CHECK ("notification_outbox"."kind" in ('alarm', 'digest', 'history_summary'));
