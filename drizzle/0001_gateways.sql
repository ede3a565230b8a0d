CREATE TABLE "gateways" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"name" text NOT NULL,
	"key_hash" text NOT NULL,
	"key_prefix" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"revoked_at" timestamp with time zone,
	"last_contact_at" timestamp with time zone,
	"accepted_count" bigint DEFAULT 0 NOT NULL,
	"duplicate_count" bigint DEFAULT 0 NOT NULL,
	"rejected_count" bigint DEFAULT 0 NOT NULL,
	"failed_batch_count" bigint DEFAULT 0 NOT NULL,
	"last_error" text,
	CONSTRAINT "gateways_key_hash_unique" UNIQUE("key_hash"),
	CONSTRAINT "gateways_site_name" UNIQUE("site_id","name")
);
--> statement-breakpoint
ALTER TABLE "gateways" ADD CONSTRAINT "gateways_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;