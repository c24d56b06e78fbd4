-- Each ledger row counts in a month: its own (UTC), or the next month not yet closed when its own was closed
-- before the row arrived (a late refund or webhook lands in the next open month; the closed one never changes).
CREATE FUNCTION ledger_entries_book_month() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  m date := date_trunc('month', NEW.occurred_at AT TIME ZONE 'UTC')::date;
BEGIN
  WHILE EXISTS (SELECT 1 FROM month_closes WHERE month = m) LOOP
    m := (m + interval '1 month')::date;
  END LOOP;
  NEW.booked_month := m;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER ledger_entries_booked_month
  BEFORE INSERT ON "ledger_entries"
  FOR EACH ROW EXECUTE FUNCTION ledger_entries_book_month();
--> statement-breakpoint
ALTER TABLE "ledger_entries" DISABLE TRIGGER ledger_entries_immutable;
--> statement-breakpoint
UPDATE "ledger_entries" SET booked_month = date_trunc('month', occurred_at AT TIME ZONE 'UTC')::date WHERE booked_month IS NULL;
--> statement-breakpoint
ALTER TABLE "ledger_entries" ENABLE TRIGGER ledger_entries_immutable;
--> statement-breakpoint
ALTER TABLE "ledger_entries" ALTER COLUMN "booked_month" SET NOT NULL;
--> statement-breakpoint
CREATE INDEX "ledger_entries_booked_month_idx" ON "ledger_entries" ("booked_month", "kind");
--> statement-breakpoint
-- A closed month stays closed: its row can be neither changed nor removed.
CREATE FUNCTION month_closes_refuse_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'month % is closed (% refused)', OLD.month, TG_OP USING ERRCODE = 'P0001';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER month_closes_immutable
  BEFORE UPDATE OR DELETE ON "month_closes"
  FOR EACH ROW EXECUTE FUNCTION month_closes_refuse_change();
--> statement-breakpoint
INSERT INTO "number_counters" ("name", "last_value") VALUES ('receipt', 0) ON CONFLICT DO NOTHING;
--> statement-breakpoint
INSERT INTO "books_settings" ("id", "organisation_name", "address", "registration_number") VALUES (1, '', '', '') ON CONFLICT DO NOTHING;
