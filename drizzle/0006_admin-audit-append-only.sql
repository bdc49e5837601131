-- The admin audit trail is read-only, like vetting_event: rows are added, never changed or removed.
CREATE FUNCTION "admin_audit_is_append_only"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'admin_audit is an audit trail: rows cannot be changed or deleted';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER "admin_audit_no_update" BEFORE UPDATE OR DELETE ON "admin_audit"
	FOR EACH ROW EXECUTE FUNCTION "admin_audit_is_append_only"();
--> statement-breakpoint
CREATE TRIGGER "admin_audit_no_truncate" BEFORE TRUNCATE ON "admin_audit"
	FOR EACH STATEMENT EXECUTE FUNCTION "admin_audit_is_append_only"();
