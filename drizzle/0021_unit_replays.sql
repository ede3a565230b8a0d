ALTER TABLE "replays" ALTER COLUMN "tag_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "replays" ALTER COLUMN "settings" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "replays" ADD COLUMN "unit_id" integer;--> statement-breakpoint
ALTER TABLE "replays" ADD CONSTRAINT "replays_unit_id_units_id_fk" FOREIGN KEY ("unit_id") REFERENCES "public"."units"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "replays" ADD CONSTRAINT "replays_target" CHECK (("replays"."tag_id" is null) <> ("replays"."unit_id" is null) and ("replays"."tag_id" is null or "replays"."settings" is not null));