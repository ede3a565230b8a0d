CREATE TABLE "opcua_connections" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"name" text NOT NULL,
	"endpoint_url" text NOT NULL,
	"security_mode" text DEFAULT 'None' NOT NULL,
	"security_policy" text DEFAULT 'None' NOT NULL,
	"username" text,
	"password_secret" text,
	"sampling_interval_ms" integer DEFAULT 1000 NOT NULL,
	"publishing_interval_ms" integer DEFAULT 1000 NOT NULL,
	"enabled" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"config_version" integer DEFAULT 1 NOT NULL,
	"state" text DEFAULT 'idle' NOT NULL,
	"state_since" timestamp with time zone,
	"owner" text,
	"last_value_at" timestamp with time zone,
	"values_per_minute" integer DEFAULT 0 NOT NULL,
	"accepted_count" bigint DEFAULT 0 NOT NULL,
	"duplicate_count" bigint DEFAULT 0 NOT NULL,
	"rejected_count" bigint DEFAULT 0 NOT NULL,
	"backfilled_count" bigint DEFAULT 0 NOT NULL,
	"reconnect_count" bigint DEFAULT 0 NOT NULL,
	"last_error" text,
	"last_error_at" timestamp with time zone,
	CONSTRAINT "opcua_connections_site_name" UNIQUE("site_id","name"),
	CONSTRAINT "opcua_connections_security_mode" CHECK ("opcua_connections"."security_mode" in ('None', 'Sign', 'SignAndEncrypt')),
	CONSTRAINT "opcua_connections_intervals" CHECK ("opcua_connections"."sampling_interval_ms" >= 0 and "opcua_connections"."publishing_interval_ms" > 0)
);
--> statement-breakpoint
CREATE TABLE "opcua_mappings" (
	"id" serial PRIMARY KEY NOT NULL,
	"connection_id" integer NOT NULL,
	"node_id" text NOT NULL,
	"tag_id" integer NOT NULL,
	"display_name" text DEFAULT '' NOT NULL,
	"time_basis" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "opcua_mappings_tag_id_unique" UNIQUE("tag_id"),
	CONSTRAINT "opcua_mappings_connection_node" UNIQUE("connection_id","node_id")
);
--> statement-breakpoint
ALTER TABLE "opcua_connections" ADD CONSTRAINT "opcua_connections_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "opcua_mappings" ADD CONSTRAINT "opcua_mappings_connection_id_opcua_connections_id_fk" FOREIGN KEY ("connection_id") REFERENCES "public"."opcua_connections"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "opcua_mappings" ADD CONSTRAINT "opcua_mappings_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;