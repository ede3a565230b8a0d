-- Two sessions asking for the same missing partition at once: the second waited on the advisory
-- lock, then its check still missed the table the first had just made and committed (an advisory
-- lock does not refresh a session's catalog cache, which to_regclass reads), and its CREATE TABLE
-- failed with "already exists" — a 500 on concurrent ingest of a new day. After the lock the
-- check now reads pg_class through a fresh snapshot, and a table made meanwhile all the same is
-- taken as made.
CREATE OR REPLACE FUNCTION brinkline_ensure_partition(parent text, at timestamptz) RETURNS text
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
  IF EXISTS (SELECT 1 FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace WHERE c.relname = child AND n.nspname = 'public') THEN
    RETURN child;
  END IF;
  BEGIN
    EXECUTE format('CREATE TABLE %I (LIKE %I INCLUDING DEFAULTS)', child, parent);
    EXECUTE format('WITH moved AS (DELETE FROM %I WHERE %I >= %L AND %I < %L RETURNING *) INSERT INTO %I SELECT * FROM moved',
      parent || '_default', col, start_at, col, end_at, child);
    EXECUTE format('ALTER TABLE %I ATTACH PARTITION %I FOR VALUES FROM (%L) TO (%L)', parent, child, start_at, end_at);
  EXCEPTION WHEN duplicate_table THEN
    RETURN child;
  END;
  RETURN child;
END $$;
