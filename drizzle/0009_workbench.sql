CREATE TABLE "indicator_settings_versions" (
	"id" serial PRIMARY KEY NOT NULL,
	"tag_id" integer NOT NULL,
	"settings" jsonb NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" integer
);
--> statement-breakpoint
CREATE TABLE "bump_tests" (
	"id" serial PRIMARY KEY NOT NULL,
	"tag_id" integer NOT NULL,
	"step_time" timestamp with time zone NOT NULL,
	"step_size" double precision NOT NULL,
	"response_s" double precision NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"recorded_by" integer,
	"fit_status" text,
	"fit_reason" text,
	"rate" double precision,
	"rate_se" double precision,
	"residual_sd" double precision,
	"initial_value" double precision,
	"final_value" double precision,
	"passive_rate" double precision,
	"passive_rate_se" double precision,
	"fitted_at" timestamp with time zone,
	CONSTRAINT "bump_tests_values" CHECK ("bump_tests"."step_size" <> 0 and "bump_tests"."response_s" > 0),
	CONSTRAINT "bump_tests_fit_status" CHECK ("bump_tests"."fit_status" is null or "bump_tests"."fit_status" in ('fit', 'no fit'))
);
--> statement-breakpoint
ALTER TABLE "sites" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "tags" ADD COLUMN "quantisation_step" double precision DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "tags" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "tags" ADD COLUMN "loop_tag_id" integer;--> statement-breakpoint
ALTER TABLE "tags" ADD COLUMN "loop_role" text;--> statement-breakpoint
ALTER TABLE "units" ADD COLUMN "retired_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "indicator_points" ADD COLUMN "settings_version_id" integer;--> statement-breakpoint
ALTER TABLE "indicator_settings" ADD COLUMN "version_id" integer;--> statement-breakpoint
ALTER TABLE "alarm_rules" ADD COLUMN "time_to_respond_s" double precision;--> statement-breakpoint
ALTER TABLE "indicator_settings_versions" ADD CONSTRAINT "indicator_settings_versions_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "indicator_settings_versions" ADD CONSTRAINT "indicator_settings_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bump_tests" ADD CONSTRAINT "bump_tests_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bump_tests" ADD CONSTRAINT "bump_tests_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "indicator_settings_versions_tag" ON "indicator_settings_versions" USING btree ("tag_id","id");--> statement-breakpoint
CREATE INDEX "bump_tests_tag" ON "bump_tests" USING btree ("tag_id","step_time");--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_loop_tag_id_tags_id_fk" FOREIGN KEY ("loop_tag_id") REFERENCES "public"."tags"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "indicator_points" ADD CONSTRAINT "indicator_points_settings_version_id_indicator_settings_versions_id_fk" FOREIGN KEY ("settings_version_id") REFERENCES "public"."indicator_settings_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "indicator_settings" ADD CONSTRAINT "indicator_settings_version_id_indicator_settings_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."indicator_settings_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_loop_role" CHECK ("tags"."loop_role" in ('controller_output', 'setpoint'));--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_loop_link" CHECK (("tags"."loop_tag_id" is null) = ("tags"."loop_role" is null) and "tags"."loop_tag_id" <> "tags"."id");--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_range" CHECK ("tags"."range_low" < "tags"."range_high" and "tags"."sample_period_s" > 0 and "tags"."noise_floor" >= 0 and "tags"."quantisation_step" >= 0);--> statement-breakpoint
ALTER TABLE "alarm_rules" ADD CONSTRAINT "alarm_rules_time_to_respond" CHECK ("alarm_rules"."time_to_respond_s" is null or "alarm_rules"."time_to_respond_s" > 0);