-- Rules of the held-funds ledger that Drizzle cannot express: entries and transactions are
-- append-only (a mistake is reversed, never edited), and every transaction balances to zero with at
-- least two entries, checked at commit so a transaction's entries can be inserted one by one.
CREATE FUNCTION "ledger_is_append_only"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION '% is an append-only ledger: rows cannot be changed or deleted; post a reversal', TG_TABLE_NAME;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER "ledger_entry_no_update" BEFORE UPDATE OR DELETE ON "ledger_entry"
	FOR EACH ROW EXECUTE FUNCTION "ledger_is_append_only"();
--> statement-breakpoint
CREATE TRIGGER "ledger_entry_no_truncate" BEFORE TRUNCATE ON "ledger_entry"
	FOR EACH STATEMENT EXECUTE FUNCTION "ledger_is_append_only"();
--> statement-breakpoint
CREATE TRIGGER "ledger_transaction_no_update" BEFORE UPDATE OR DELETE ON "ledger_transaction"
	FOR EACH ROW EXECUTE FUNCTION "ledger_is_append_only"();
--> statement-breakpoint
CREATE TRIGGER "ledger_transaction_no_truncate" BEFORE TRUNCATE ON "ledger_transaction"
	FOR EACH STATEMENT EXECUTE FUNCTION "ledger_is_append_only"();
--> statement-breakpoint
CREATE FUNCTION "ledger_transaction_balances"() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
	total bigint;
	entries integer;
BEGIN
	SELECT coalesce(sum("amount_cents"), 0), count(*) INTO total, entries
		FROM "ledger_entry" WHERE "transaction_id" = NEW."transaction_id";
	IF total <> 0 OR entries < 2 THEN
		RAISE EXCEPTION 'ledger transaction % does not balance: % entries summing to % cents',
			NEW."transaction_id", entries, total;
	END IF;
	RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER "ledger_entry_balances" AFTER INSERT ON "ledger_entry"
	DEFERRABLE INITIALLY DEFERRED
	FOR EACH ROW EXECUTE FUNCTION "ledger_transaction_balances"();
