import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Least privilege for the identity tables, and current roles wherever a record function reads roles:
 * - the runtime role no longer reads password_credentials.hash (infra/database/migrate.ts HIDDEN_COLUMNS): the
 *   service asks leadline_password_hash, which answers only to the service credential (derived from the record key,
 *   which the database does not hold), so a connection as the runtime role alone cannot collect hashes to crack;
 * - leadline_append_event checked a calculation-reassigned event's new owner against users.roles (the roles given at
 *   creation): it now reads leadline_user_roles and leadline_user_active, the roles and deactivation as the identity
 *   events say, like every other check. The function's body is otherwise unchanged: it is rewritten from its stored
 *   definition, and the migration fails if the text it replaces is not there.
 */
export class HidPasswordHashesAndReadCurrentRoles20261206030100 implements MigrationInterface {
  name = 'HidPasswordHashesAndReadCurrentRoles20261206030100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE FUNCTION leadline_password_hash(p_credential text, p_user uuid) RETURNS text
      LANGUAGE plpgsql STABLE SECURITY DEFINER SET search_path = public, pg_temp AS $$
      DECLARE c record;
      BEGIN
        SELECT * INTO c FROM leadline_credential(p_credential);
        IF NOT c.is_service THEN
          RAISE EXCEPTION 'leadline: a password hash is read by the service only, to check a password' USING ERRCODE = 'LL403';
        END IF;
        RETURN (SELECT p.hash FROM password_credentials p WHERE p.user_id = p_user ORDER BY p.created_at DESC, p.id DESC LIMIT 1);
      END $$`);
    await q.query(`REVOKE ALL ON FUNCTION leadline_password_hash(text, uuid) FROM PUBLIC`);
    await q.query(`
      DO $$
      DECLARE
        fn regprocedure := 'leadline_append_event(text, uuid, uuid, bigint, text, uuid, uuid, jsonb, uuid, jsonb, text, text, text, text)'::regprocedure;
        old_text text := 'SELECT u.id, u.roles INTO v_to FROM users u WHERE u.id = (p_data->''to''->>''id'')::uuid;';
        new_text text := 'SELECT u.id, leadline_user_roles(u.id) AS roles INTO v_to FROM users u WHERE u.id = (p_data->''to''->>''id'')::uuid AND leadline_user_active(u.id);';
        def text := pg_get_functiondef(fn);
      BEGIN
        IF position(old_text IN def) = 0 THEN
          RAISE EXCEPTION 'leadline_append_event does not read users.roles as expected: not rewritten';
        END IF;
        EXECUTE replace(def, old_text, new_text);
      END $$`);
  }

  async down(): Promise<void> {
    throw new Error('the record functions are part of the record model: this migration is not reversible');
  }
}
