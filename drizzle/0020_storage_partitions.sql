-- Storage that lasts (issue 13 item 9): samples partitioned by UTC day, a per-minute archive
-- partitioned by UTC month, a raw window per site and the storage job's size snapshots.
-- Native declarative partitioning with our own maintenance (server/services/storage/), not
-- pg_partman: see docs/architecture.md, "Sample storage".
ALTER TABLE "sites" ADD COLUMN "raw_retention_days" integer;--> statement-breakpoint
ALTER TABLE "sites" ADD CONSTRAINT "sites_raw_retention_days" CHECK ("sites"."raw_retention_days" is null or "sites"."raw_retention_days" between 1 and 3650);--> statement-breakpoint
CREATE TABLE "storage_snapshots" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"taken_at" timestamp with time zone DEFAULT now() NOT NULL,
	"database_bytes" bigint NOT NULL,
	"sample_rows" bigint NOT NULL,
	"archive_rows" bigint NOT NULL
);
--> statement-breakpoint
-- The existing table steps aside under another name; its rows move into the partitions below.
ALTER TABLE "samples" RENAME TO "samples_unpartitioned";--> statement-breakpoint
ALTER TABLE "samples_unpartitioned" RENAME CONSTRAINT "samples_tag_id_time_pk" TO "samples_unpartitioned_pk";--> statement-breakpoint
ALTER TABLE "samples_unpartitioned" RENAME CONSTRAINT "samples_tag_id_tags_id_fk" TO "samples_unpartitioned_tag_fk";--> statement-breakpoint
-- The key keeps (tag_id, time): it includes the partition key, as a unique key on a
-- partitioned table must, and ingest stays idempotent on tag + time.
CREATE TABLE "samples" (
	"tag_id" integer NOT NULL,
	"time" timestamp with time zone NOT NULL,
	"value" double precision NOT NULL,
	"quality" smallint DEFAULT 0 NOT NULL,
	CONSTRAINT "samples_tag_id_time_pk" PRIMARY KEY("tag_id","time")
) PARTITION BY RANGE ("time");
--> statement-breakpoint
ALTER TABLE "samples" ADD CONSTRAINT "samples_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- Catches a row no day partition covers yet (a far-future stamp, a direct insert): an insert never
-- fails for want of a partition. The storage job moves what it holds into day partitions.
CREATE TABLE "samples_default" PARTITION OF "samples" DEFAULT;--> statement-breakpoint
CREATE TABLE "samples_minute" (
	"tag_id" integer NOT NULL,
	"minute" timestamp with time zone NOT NULL,
	"value_min" double precision,
	"value_mean" double precision,
	"value_max" double precision,
	"samples" integer NOT NULL,
	"bad_samples" integer NOT NULL,
	CONSTRAINT "samples_minute_tag_id_minute_pk" PRIMARY KEY("tag_id","minute")
) PARTITION BY RANGE ("minute");
--> statement-breakpoint
ALTER TABLE "samples_minute" ADD CONSTRAINT "samples_minute_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE TABLE "samples_minute_default" PARTITION OF "samples_minute" DEFAULT;--> statement-breakpoint
-- The one partition of `parent` (samples: a UTC day, samples_minute: a UTC month) that holds
-- `at`, made if missing; rows the default partition holds for its range move into it first (the
-- default must hold none of a partition's range when it is attached). One maker at a time per
-- table (advisory lock), so two sessions never race to create the same partition. Security
-- definer, so a database role that owns no tables can still ask for a partition.
CREATE FUNCTION brinkline_ensure_partition(parent text, at timestamptz) RETURNS text
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
DECLARE
  unit text;
  col text;
  start_at timestamptz;
  end_at timestamptz;
  child text;
BEGIN
  IF parent = 'samples' THEN unit := 'day'; col := 'time';
  ELSIF parent = 'samples_minute' THEN unit := 'month'; col := 'minute';
  ELSE RAISE EXCEPTION 'no partition scheme for %', parent;
  END IF;
  start_at := date_trunc(unit, at AT TIME ZONE 'UTC') AT TIME ZONE 'UTC';
  end_at := ((start_at AT TIME ZONE 'UTC') + ('1 ' || unit)::interval) AT TIME ZONE 'UTC';
  child := parent || '_p' || to_char(start_at AT TIME ZONE 'UTC', CASE unit WHEN 'day' THEN 'YYYYMMDD' ELSE 'YYYYMM' END);
  IF to_regclass(child) IS NOT NULL THEN RETURN child; END IF;
  PERFORM pg_advisory_xact_lock(hashtext('brinkline_partitions:' || parent));
  IF to_regclass(child) IS NOT NULL THEN RETURN child; END IF;
  EXECUTE format('CREATE TABLE %I (LIKE %I INCLUDING DEFAULTS)', child, parent);
  EXECUTE format('WITH moved AS (DELETE FROM %I WHERE %I >= %L AND %I < %L RETURNING *) INSERT INTO %I SELECT * FROM moved',
    parent || '_default', col, start_at, col, end_at, child);
  EXECUTE format('ALTER TABLE %I ATTACH PARTITION %I FOR VALUES FROM (%L) TO (%L)', parent, child, start_at, end_at);
  RETURN child;
END $$;
--> statement-breakpoint
-- Existing rows: a partition for every day that has data (within the accepted sample years), then
-- the copy; anything else lands in the default partition. Nothing is dropped or changed.
SELECT brinkline_ensure_partition('samples', d) FROM (
  SELECT DISTINCT date_trunc('day', "time" AT TIME ZONE 'UTC') AT TIME ZONE 'UTC' AS d FROM "samples_unpartitioned"
  WHERE "time" >= '2000-01-01T00:00:00Z' AND "time" < now() + interval '4 days'
) days;--> statement-breakpoint
SELECT brinkline_ensure_partition('samples', now() + n * interval '1 day') FROM generate_series(0, 3) n;--> statement-breakpoint
SELECT brinkline_ensure_partition('samples_minute', now() + n * interval '1 month') FROM generate_series(0, 1) n;--> statement-breakpoint
INSERT INTO "samples" ("tag_id", "time", "value", "quality") SELECT "tag_id", "time", "value", "quality" FROM "samples_unpartitioned";--> statement-breakpoint
DROP TABLE "samples_unpartitioned";
