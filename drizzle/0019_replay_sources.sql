CREATE TABLE "replay_samples" (
	"replay_id" integer NOT NULL,
	"time" timestamp with time zone NOT NULL,
	"value" double precision NOT NULL,
	"quality" smallint DEFAULT 0 NOT NULL,
	CONSTRAINT "replay_samples_replay_id_time_pk" PRIMARY KEY("replay_id","time")
);
--> statement-breakpoint
ALTER TABLE "replays" ADD COLUMN "settings_in_force" jsonb;--> statement-breakpoint
ALTER TABLE "replays" ADD COLUMN "source" text DEFAULT 'history' NOT NULL;--> statement-breakpoint
ALTER TABLE "replays" ADD COLUMN "job_id" text;--> statement-breakpoint
ALTER TABLE "replay_samples" ADD CONSTRAINT "replay_samples_replay_id_replays_id_fk" FOREIGN KEY ("replay_id") REFERENCES "public"."replays"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "replays" ADD CONSTRAINT "replays_source" CHECK ("replays"."source" in ('history', 'upload'));