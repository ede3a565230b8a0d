CREATE TABLE "replays" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"tag_id" integer NOT NULL,
	"from_time" timestamp with time zone NOT NULL,
	"to_time" timestamp with time zone NOT NULL,
	"event_time" timestamp with time zone,
	"warning_window_s" double precision NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"alternative_settings" boolean DEFAULT false NOT NULL,
	"settings" jsonb NOT NULL,
	"rules" jsonb NOT NULL,
	"state" text DEFAULT 'queued' NOT NULL,
	"progress" double precision DEFAULT 0 NOT NULL,
	"samples_total" integer,
	"samples_done" integer DEFAULT 0 NOT NULL,
	"result" jsonb,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"created_by" integer,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	CONSTRAINT "replays_state" CHECK ("replays"."state" in ('queued', 'running', 'done', 'failed')),
	CONSTRAINT "replays_range" CHECK ("replays"."from_time" < "replays"."to_time"),
	CONSTRAINT "replays_progress" CHECK ("replays"."progress" >= 0 and "replays"."progress" <= 1),
	CONSTRAINT "replays_warning_window" CHECK ("replays"."warning_window_s" > 0)
);
--> statement-breakpoint
ALTER TABLE "replays" ADD CONSTRAINT "replays_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "replays" ADD CONSTRAINT "replays_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "replays" ADD CONSTRAINT "replays_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "replays_created" ON "replays" USING btree ("created_at");