CREATE TABLE "alert_outcomes" (
	"alarm_id" bigint PRIMARY KEY NOT NULL,
	"outcome" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"marked_by" integer,
	"marked_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "alert_outcomes_outcome" CHECK ("alert_outcomes"."outcome" in ('false', 'averted'))
);
--> statement-breakpoint
CREATE TABLE "incident_alarms" (
	"alarm_id" bigint PRIMARY KEY NOT NULL,
	"incident_id" bigint NOT NULL,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL,
	"added_by" integer
);
--> statement-breakpoint
CREATE TABLE "incidents" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"unit_id" integer NOT NULL,
	"title" text DEFAULT '' NOT NULL,
	"state" text DEFAULT 'open' NOT NULL,
	"origin" text NOT NULL,
	"early_warning_at" timestamp with time zone,
	"limit_alarm_at" timestamp with time zone,
	"lead_time_s" double precision,
	"what_happened" text DEFAULT '' NOT NULL,
	"cause" text DEFAULT '' NOT NULL,
	"actions" text DEFAULT '' NOT NULL,
	"lessons" text DEFAULT '' NOT NULL,
	"signed_off_at" timestamp with time zone,
	"signed_off_by" integer,
	"signed_off_by_name" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" integer,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "incidents_state" CHECK ("incidents"."state" in ('open', 'under_review', 'closed')),
	CONSTRAINT "incidents_origin" CHECK ("incidents"."origin" in ('automatic', 'manual')),
	CONSTRAINT "incidents_signed_off" CHECK ("incidents"."state" <> 'closed' or ("incidents"."signed_off_at" is not null and "incidents"."signed_off_by_name" is not null))
);
--> statement-breakpoint
CREATE TABLE "site_review_settings" (
	"site_id" integer PRIMARY KEY NOT NULL,
	"incident_window_s" double precision DEFAULT 1800 NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" integer,
	CONSTRAINT "site_review_settings_window" CHECK ("site_review_settings"."incident_window_s" > 0 and "site_review_settings"."incident_window_s" <= 86400)
);
--> statement-breakpoint
ALTER TABLE "alert_outcomes" ADD CONSTRAINT "alert_outcomes_alarm_id_alarms_id_fk" FOREIGN KEY ("alarm_id") REFERENCES "public"."alarms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alert_outcomes" ADD CONSTRAINT "alert_outcomes_marked_by_users_id_fk" FOREIGN KEY ("marked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incident_alarms" ADD CONSTRAINT "incident_alarms_alarm_id_alarms_id_fk" FOREIGN KEY ("alarm_id") REFERENCES "public"."alarms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incident_alarms" ADD CONSTRAINT "incident_alarms_incident_id_incidents_id_fk" FOREIGN KEY ("incident_id") REFERENCES "public"."incidents"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incident_alarms" ADD CONSTRAINT "incident_alarms_added_by_users_id_fk" FOREIGN KEY ("added_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_signed_off_by_users_id_fk" FOREIGN KEY ("signed_off_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_review_settings" ADD CONSTRAINT "site_review_settings_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_review_settings" ADD CONSTRAINT "site_review_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "incident_alarms_incident" ON "incident_alarms" USING btree ("incident_id");--> statement-breakpoint
CREATE INDEX "incidents_site_state" ON "incidents" USING btree ("site_id","state");--> statement-breakpoint
CREATE INDEX "incidents_unit" ON "incidents" USING btree ("unit_id");