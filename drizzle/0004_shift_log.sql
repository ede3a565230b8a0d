CREATE TABLE "shift_log_notes" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"author_id" integer,
	"at" timestamp with time zone NOT NULL,
	"body" text NOT NULL,
	"unit_id" integer,
	"tag_id" integer,
	"alarm_id" bigint,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "shift_log_notes_body" CHECK (length("shift_log_notes"."body") between 1 and 4000)
);
--> statement-breakpoint
ALTER TABLE "shift_log_notes" ADD CONSTRAINT "shift_log_notes_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shift_log_notes" ADD CONSTRAINT "shift_log_notes_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shift_log_notes" ADD CONSTRAINT "shift_log_notes_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shift_log_notes" ADD CONSTRAINT "shift_log_notes_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shift_log_notes" ADD CONSTRAINT "shift_log_notes_alarm_id_alarms_id_fk" FOREIGN KEY ("alarm_id") REFERENCES "public"."alarms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "shift_log_notes_site_at" ON "shift_log_notes" USING btree ("site_id","at");