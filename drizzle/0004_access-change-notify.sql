-- Access changes wake every app instance at once (server/collab/room-bus.ts listens): a new row of
-- the role audit trail, a session ended, an API token revoked. The payload only says which kind;
-- each instance reads what changed from the tables, as it does on its own timer.
CREATE FUNCTION mechweave_notify_access() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('mechweave_access', TG_ARGV[0]);
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER role_changes_notify AFTER INSERT ON role_changes FOR EACH STATEMENT EXECUTE FUNCTION mechweave_notify_access('roles');
--> statement-breakpoint
CREATE TRIGGER sessions_notify AFTER DELETE ON sessions FOR EACH STATEMENT EXECUTE FUNCTION mechweave_notify_access('credentials');
--> statement-breakpoint
CREATE TRIGGER api_tokens_notify AFTER UPDATE OF revoked_at ON api_tokens FOR EACH STATEMENT EXECUTE FUNCTION mechweave_notify_access('credentials');
