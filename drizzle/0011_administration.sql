CREATE TABLE "password_tokens" (
	"id" serial PRIMARY KEY NOT NULL,
	"user_id" integer NOT NULL,
	"token_hash" text NOT NULL,
	"purpose" text NOT NULL,
	"created_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone,
	CONSTRAINT "password_tokens_token_hash_unique" UNIQUE("token_hash"),
	CONSTRAINT "password_tokens_purpose" CHECK ("password_tokens"."purpose" in ('invite', 'reset'))
);
--> statement-breakpoint
CREATE TABLE "gateway_hourly" (
	"gateway_id" integer NOT NULL,
	"hour" timestamp with time zone NOT NULL,
	"accepted_count" bigint DEFAULT 0 NOT NULL,
	"duplicate_count" bigint DEFAULT 0 NOT NULL,
	"rejected_count" bigint DEFAULT 0 NOT NULL,
	"failed_batch_count" bigint DEFAULT 0 NOT NULL,
	CONSTRAINT "gateway_hourly_gateway_id_hour_pk" PRIMARY KEY("gateway_id","hour")
);
--> statement-breakpoint
ALTER TABLE "notification_outbox" DROP CONSTRAINT "notification_outbox_kind";--> statement-breakpoint
ALTER TABLE "users" ALTER COLUMN "password_hash" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_outbox" ALTER COLUMN "site_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "sessions_valid_after" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "gateways" ADD COLUMN "previous_key_hash" text;--> statement-breakpoint
ALTER TABLE "gateways" ADD COLUMN "previous_key_prefix" text;--> statement-breakpoint
ALTER TABLE "gateways" ADD COLUMN "previous_key_expires_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "gateways" ADD COLUMN "key_rotated_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "notification_outbox" ADD COLUMN "route_ids" integer[] DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "name" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "alarm_classes" text[] DEFAULT '{alarm,alert}' NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "delivery" text DEFAULT 'immediate' NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "hours" text DEFAULT 'always' NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "work_start_minute" integer DEFAULT 420 NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "work_end_minute" integer DEFAULT 1140 NOT NULL;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD COLUMN "work_days" integer[] DEFAULT '{1,2,3,4,5}' NOT NULL;--> statement-breakpoint
ALTER TABLE "password_tokens" ADD CONSTRAINT "password_tokens_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "password_tokens" ADD CONSTRAINT "password_tokens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gateway_hourly" ADD CONSTRAINT "gateway_hourly_gateway_id_gateways_id_fk" FOREIGN KEY ("gateway_id") REFERENCES "public"."gateways"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "password_tokens_user" ON "password_tokens" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "audit_log_user_at" ON "audit_log" USING btree ("user_id","at");--> statement-breakpoint
CREATE INDEX "audit_log_action_at" ON "audit_log" USING btree ("action","at");--> statement-breakpoint
CREATE INDEX "notification_outbox_routes" ON "notification_outbox" USING gin ("route_ids");--> statement-breakpoint
ALTER TABLE "gateways" ADD CONSTRAINT "gateways_previous_key_hash_unique" UNIQUE("previous_key_hash");--> statement-breakpoint
ALTER TABLE "notification_outbox" ADD CONSTRAINT "notification_outbox_kind" CHECK ("notification_outbox"."kind" in ('alarm', 'digest', 'history_summary', 'test', 'account'));--> statement-breakpoint
ALTER TABLE "notification_routes" ADD CONSTRAINT "notification_routes_classes" CHECK ("notification_routes"."alarm_classes" <@ array['alarm', 'alert']::text[] and cardinality("notification_routes"."alarm_classes") > 0);--> statement-breakpoint
ALTER TABLE "notification_routes" ADD CONSTRAINT "notification_routes_delivery" CHECK ("notification_routes"."delivery" in ('immediate', 'digest'));--> statement-breakpoint
ALTER TABLE "notification_routes" ADD CONSTRAINT "notification_routes_hours" CHECK ("notification_routes"."hours" in ('always', 'working'));--> statement-breakpoint
ALTER TABLE "notification_routes" ADD CONSTRAINT "notification_routes_work_minutes" CHECK ("notification_routes"."work_start_minute" between 0 and 1439 and "notification_routes"."work_end_minute" between 0 and 1439 and "notification_routes"."work_start_minute" <> "notification_routes"."work_end_minute");--> statement-breakpoint
-- The audit trail is appended to, never rewritten: UPDATE, DELETE and TRUNCATE are refused for
-- every role, the table owner included (only dropping the trigger, which needs the owner, lifts it).
CREATE FUNCTION audit_log_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'audit_log is append-only (% refused)', TG_OP USING ERRCODE = 'insufficient_privilege';
END $$;
--> statement-breakpoint
CREATE TRIGGER audit_log_append_only BEFORE UPDATE OR DELETE ON audit_log
  FOR EACH ROW EXECUTE FUNCTION audit_log_append_only();
--> statement-breakpoint
CREATE TRIGGER audit_log_no_truncate BEFORE TRUNCATE ON audit_log
  FOR EACH STATEMENT EXECUTE FUNCTION audit_log_append_only();
