CREATE TABLE "indicator_points" (
	"tag_id" integer NOT NULL,
	"time" timestamp with time zone NOT NULL,
	"quality" text,
	"variance" double precision,
	"std" double precision,
	"cv" double precision,
	"ar1" double precision,
	"recovery_rate" double precision,
	"skewness" double precision,
	"kurtosis" double precision,
	"tau_ar1" double precision,
	"p_ar1" double precision,
	"tau_variance" double precision,
	"p_variance" double precision,
	"evidence" text,
	"fold_seconds" double precision,
	"fold_low_seconds" double precision,
	"fold_high_seconds" double precision,
	CONSTRAINT "indicator_points_tag_id_time_pk" PRIMARY KEY("tag_id","time")
);
--> statement-breakpoint
CREATE TABLE "indicator_settings" (
	"tag_id" integer PRIMARY KEY NOT NULL,
	"window_samples" integer NOT NULL,
	"detrend_bandwidth_s" double precision NOT NULL,
	"trend_window_samples" integer NOT NULL,
	"indicator_step" integer NOT NULL,
	"evaluate_every" integer NOT NULL,
	"surrogates" integer NOT NULL,
	"alpha" double precision NOT NULL,
	"min_tau" double precision NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" integer,
	CONSTRAINT "indicator_settings_sizes" CHECK ("indicator_settings"."window_samples" >= 20 and "indicator_settings"."trend_window_samples" > "indicator_settings"."window_samples" and "indicator_settings"."indicator_step" >= 1 and "indicator_settings"."evaluate_every" >= 1 and "indicator_settings"."surrogates" >= 19)
);
--> statement-breakpoint
CREATE TABLE "tag_analysis_state" (
	"tag_id" integer PRIMARY KEY NOT NULL,
	"last_sample_time" timestamp with time zone,
	"last_evaluated_time" timestamp with time zone,
	"samples_since_evaluation" integer DEFAULT 0 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "tag_status" (
	"tag_id" integer PRIMARY KEY NOT NULL,
	"status" text NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"latest_value" double precision,
	"latest_time" timestamp with time zone,
	"leading_indicator" text,
	"leading_value" double precision,
	"tau" double precision,
	"p_value" double precision,
	"fold_kind" text DEFAULT 'none' NOT NULL,
	"fold_seconds" double precision,
	"fold_low_seconds" double precision,
	"fold_high_seconds" double precision,
	"unacked_alarms" integer DEFAULT 0 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tag_status_status" CHECK ("tag_status"."status" in ('steady', 'watch', 'warning', 'alarm', 'no data', 'bad quality')),
	CONSTRAINT "tag_status_fold_kind" CHECK ("tag_status"."fold_kind" in ('projected', 'none'))
);
--> statement-breakpoint
CREATE TABLE "unit_slow_mode" (
	"unit_id" integer NOT NULL,
	"time" timestamp with time zone NOT NULL,
	"recovery_rate" double precision,
	"shares" jsonb NOT NULL,
	CONSTRAINT "unit_slow_mode_unit_id_time_pk" PRIMARY KEY("unit_id","time")
);
--> statement-breakpoint
CREATE TABLE "alarm_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"alarm_id" bigint NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"condition_time" timestamp with time zone,
	"event" text NOT NULL,
	"from_state" text,
	"to_state" text NOT NULL,
	"actor" text NOT NULL,
	"user_id" integer,
	"comment" text DEFAULT '' NOT NULL,
	"value" double precision,
	"request_id" text
);
--> statement-breakpoint
CREATE TABLE "alarm_rule_states" (
	"rule_id" integer PRIMARY KEY NOT NULL,
	"active" boolean DEFAULT false NOT NULL,
	"pending_since" timestamp with time zone,
	"clearing_since" timestamp with time zone,
	"last_value" double precision,
	"last_time" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "alarm_rules" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"target_kind" text NOT NULL,
	"tag_id" integer,
	"unit_id" integer NOT NULL,
	"name" text NOT NULL,
	"measure" text NOT NULL,
	"comparison" text NOT NULL,
	"threshold" double precision NOT NULL,
	"on_delay_s" double precision DEFAULT 0 NOT NULL,
	"off_delay_s" double precision DEFAULT 0 NOT NULL,
	"deadband" double precision DEFAULT 0 NOT NULL,
	"priority" text NOT NULL,
	"class" text NOT NULL,
	"consequence" text NOT NULL,
	"likely_cause" text NOT NULL,
	"operator_action" text NOT NULL,
	"mode" text DEFAULT 'in_service' NOT NULL,
	"enabled" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" integer,
	CONSTRAINT "alarm_rules_target" CHECK (("alarm_rules"."target_kind" = 'tag' and "alarm_rules"."tag_id" is not null) or ("alarm_rules"."target_kind" = 'unit' and "alarm_rules"."tag_id" is null)),
	CONSTRAINT "alarm_rules_target_kind" CHECK ("alarm_rules"."target_kind" in ('tag', 'unit')),
	CONSTRAINT "alarm_rules_measure" CHECK ("alarm_rules"."measure" in ('value', 'variance', 'std', 'cv', 'ar1', 'recovery_rate', 'skewness', 'kurtosis', 'p_ar1', 'p_variance', 'fold_horizon', 'early_warning')),
	CONSTRAINT "alarm_rules_comparison" CHECK ("alarm_rules"."comparison" in ('above', 'below')),
	CONSTRAINT "alarm_rules_priority" CHECK ("alarm_rules"."priority" in ('urgent', 'high', 'medium', 'low')),
	CONSTRAINT "alarm_rules_class" CHECK ("alarm_rules"."class" in ('alarm', 'alert')),
	CONSTRAINT "alarm_rules_mode" CHECK ("alarm_rules"."mode" in ('in_service', 'suppressed', 'out_of_service')),
	CONSTRAINT "alarm_rules_delays" CHECK ("alarm_rules"."on_delay_s" >= 0 and "alarm_rules"."off_delay_s" >= 0 and "alarm_rules"."deadband" >= 0),
	CONSTRAINT "alarm_rules_rationale" CHECK (length("alarm_rules"."consequence") > 0 and length("alarm_rules"."likely_cause") > 0 and length("alarm_rules"."operator_action") > 0)
);
--> statement-breakpoint
CREATE TABLE "alarms" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"rule_id" integer NOT NULL,
	"site_id" integer NOT NULL,
	"unit_id" integer NOT NULL,
	"tag_id" integer,
	"priority" text NOT NULL,
	"class" text NOT NULL,
	"measure" text NOT NULL,
	"comparison" text NOT NULL,
	"threshold" double precision NOT NULL,
	"state" text NOT NULL,
	"condition_active" boolean NOT NULL,
	"raised_at" timestamp with time zone NOT NULL,
	"raised_value" double precision,
	"acked_at" timestamp with time zone,
	"acked_by" integer,
	"cleared_at" timestamp with time zone,
	"closed_at" timestamp with time zone,
	"shelved_until" timestamp with time zone,
	"shelve_reason" text,
	"last_value" double precision,
	"last_value_at" timestamp with time zone,
	"context" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "alarms_state" CHECK ("alarms"."state" in ('normal', 'unacknowledged', 'acknowledged', 'rtn_unacknowledged', 'shelved', 'suppressed', 'out_of_service'))
);
--> statement-breakpoint
CREATE TABLE "notification_outbox" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"kind" text NOT NULL,
	"site_id" integer NOT NULL,
	"alarm_id" bigint,
	"alarm_ids" bigint[] DEFAULT '{}' NOT NULL,
	"recipients" text[] NOT NULL,
	"subject" text DEFAULT '' NOT NULL,
	"body" text DEFAULT '' NOT NULL,
	"status" text DEFAULT 'pending' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	"last_error" text,
	CONSTRAINT "notification_outbox_kind" CHECK ("notification_outbox"."kind" in ('alarm', 'digest')),
	CONSTRAINT "notification_outbox_status" CHECK ("notification_outbox"."status" in ('pending', 'sent', 'failed'))
);
--> statement-breakpoint
CREATE TABLE "notification_routes" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"unit_id" integer,
	"email" text,
	"role" "role",
	"min_priority" text NOT NULL,
	"enabled" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "notification_routes_recipient" CHECK (("notification_routes"."email" is null) <> ("notification_routes"."role" is null)),
	CONSTRAINT "notification_routes_priority" CHECK ("notification_routes"."min_priority" in ('urgent', 'high', 'medium', 'low'))
);
--> statement-breakpoint
CREATE TABLE "outbox_attempts" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"outbox_id" bigint NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"ok" boolean NOT NULL,
	"error" text,
	"duration_ms" integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE "indicator_points" ADD CONSTRAINT "indicator_points_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "indicator_settings" ADD CONSTRAINT "indicator_settings_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "indicator_settings" ADD CONSTRAINT "indicator_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tag_analysis_state" ADD CONSTRAINT "tag_analysis_state_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tag_status" ADD CONSTRAINT "tag_status_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "unit_slow_mode" ADD CONSTRAINT "unit_slow_mode_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_events" ADD CONSTRAINT "alarm_events_alarm_id_alarms_id_fk" FOREIGN KEY ("alarm_id") REFERENCES "public"."alarms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_events" ADD CONSTRAINT "alarm_events_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_rule_states" ADD CONSTRAINT "alarm_rule_states_rule_id_alarm_rules_id_fk" FOREIGN KEY ("rule_id") REFERENCES "public"."alarm_rules"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_rules" ADD CONSTRAINT "alarm_rules_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_rules" ADD CONSTRAINT "alarm_rules_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_rules" ADD CONSTRAINT "alarm_rules_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_rules" ADD CONSTRAINT "alarm_rules_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarms" ADD CONSTRAINT "alarms_rule_id_alarm_rules_id_fk" FOREIGN KEY ("rule_id") REFERENCES "public"."alarm_rules"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarms" ADD CONSTRAINT "alarms_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarms" ADD CONSTRAINT "alarms_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarms" ADD CONSTRAINT "alarms_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarms" ADD CONSTRAINT "alarms_acked_by_users_id_fk" FOREIGN KEY ("acked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notification_outbox" ADD CONSTRAINT "notification_outbox_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD CONSTRAINT "notification_routes_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notification_routes" ADD CONSTRAINT "notification_routes_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox_attempts" ADD CONSTRAINT "outbox_attempts_outbox_id_notification_outbox_id_fk" FOREIGN KEY ("outbox_id") REFERENCES "public"."notification_outbox"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "alarm_events_alarm" ON "alarm_events" USING btree ("alarm_id","id");--> statement-breakpoint
CREATE INDEX "alarm_events_request" ON "alarm_events" USING btree ("request_id") WHERE "alarm_events"."request_id" is not null;--> statement-breakpoint
CREATE INDEX "alarm_rules_tag" ON "alarm_rules" USING btree ("tag_id");--> statement-breakpoint
CREATE INDEX "alarm_rules_unit" ON "alarm_rules" USING btree ("unit_id");--> statement-breakpoint
CREATE UNIQUE INDEX "alarm_rules_site_name" ON "alarm_rules" USING btree ("site_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "alarms_one_open_per_rule" ON "alarms" USING btree ("rule_id") WHERE "alarms"."state" <> 'normal';--> statement-breakpoint
CREATE INDEX "alarms_open" ON "alarms" USING btree ("state") WHERE "alarms"."state" <> 'normal';--> statement-breakpoint
CREATE INDEX "alarms_site_raised" ON "alarms" USING btree ("site_id","raised_at");--> statement-breakpoint
CREATE INDEX "alarms_shelved_until" ON "alarms" USING btree ("shelved_until") WHERE "alarms"."state" = 'shelved';--> statement-breakpoint
CREATE INDEX "notification_outbox_due" ON "notification_outbox" USING btree ("next_attempt_at") WHERE "notification_outbox"."status" = 'pending';--> statement-breakpoint
CREATE UNIQUE INDEX "notification_outbox_open_digest" ON "notification_outbox" USING btree ("site_id") WHERE "notification_outbox"."kind" = 'digest' and "notification_outbox"."status" = 'pending';--> statement-breakpoint
CREATE INDEX "outbox_attempts_outbox" ON "outbox_attempts" USING btree ("outbox_id");