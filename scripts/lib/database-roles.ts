// The two database roles. The owner role owns every table and runs the migrations; the app connects as a role
// that is not a superuser, owns no table of the product and may only read, insert, update and delete rows
// (so it cannot disable a trigger, truncate a table or alter one). It may create schemas of its own, which is
// what the job queue (pg-boss) needs: pg-boss adds a partition per queue to its own job table.
import pg from "pg";

export const OWNER_ROLE = "tenthmark_owner";
export const APP_ROLE = "tenthmark_app";

const identifier = (name: string) => `"${name.replaceAll('"', '""')}"`;

/**
 * As a superuser: creates both roles (no password: the local cluster trusts loopback), makes the owner the
 * owner of the database and its public schema, and lets the app role connect and create schemas. Objects
 * a data folder made before the roles existed (owned by the superuser) are handed to their role: the
 * product's tables to the owner, the job queue's schema to the app.
 */
export async function ensureLocalRoles(superuserUrl: string, database: string) {
  const client = new pg.Client({ connectionString: superuserUrl });
  await client.connect();
  try {
    for (const role of [OWNER_ROLE, APP_ROLE]) {
      const exists = await client.query("select 1 from pg_roles where rolname = $1", [role]);
      if (exists.rowCount === 0) await client.query(`create role ${identifier(role)} login nosuperuser nocreatedb nocreaterole noreplication nobypassrls`);
    }
    // Locally the owner may create databases (tests make throwaway ones); the app role never.
    await client.query(`alter role ${identifier(OWNER_ROLE)} createdb`);
    await client.query(`alter database ${identifier(database)} owner to ${identifier(OWNER_ROLE)}`);
    await client.query(`alter schema public owner to ${identifier(OWNER_ROLE)}`);
    await client.query(`revoke create on schema public from public`);
    await client.query(`grant connect, create, temporary on database ${identifier(database)} to ${identifier(APP_ROLE)}`);
    const schemas = await client.query<{ name: string }>(
      `select nspname as name from pg_namespace where nspowner = (select oid from pg_roles where rolname = current_user)
         and nspname not in ('pg_catalog', 'information_schema', 'pg_toast') and nspname not like 'pg\\_%'`,
    );
    for (const { name } of schemas.rows) await handOver(client, name, name === "public" || name === "drizzle" ? OWNER_ROLE : APP_ROLE);
    await handOver(client, "public", OWNER_ROLE);
  } finally {
    await client.end();
  }
}

/** Gives a schema and everything in it that the current (super)user owns to `role`. */
async function handOver(client: pg.Client, schema: string, role: string) {
  await client.query(`alter schema ${identifier(schema)} owner to ${identifier(role)}`);
  await client.query(
    `do $$
     declare item record;
     begin
       for item in select c.relname, c.relkind from pg_class c join pg_namespace n on n.oid = c.relnamespace
                   where n.nspname = ${pg.escapeLiteral(schema)} and c.relowner = (select oid from pg_roles where rolname = current_user)
                     and c.relkind in ('r', 'p', 'v', 'm', 'f') loop
         execute format('alter table %I.%I owner to %I', ${pg.escapeLiteral(schema)}, item.relname, ${pg.escapeLiteral(role)});
       end loop;
       for item in select c.relname from pg_class c join pg_namespace n on n.oid = c.relnamespace
                   where n.nspname = ${pg.escapeLiteral(schema)} and c.relkind = 'S' and c.relowner = (select oid from pg_roles where rolname = current_user) loop
         execute format('alter sequence %I.%I owner to %I', ${pg.escapeLiteral(schema)}, item.relname, ${pg.escapeLiteral(role)});
       end loop;
       for item in select t.typname from pg_type t join pg_namespace n on n.oid = t.typnamespace
                   where n.nspname = ${pg.escapeLiteral(schema)} and t.typtype in ('e', 'd') and t.typowner = (select oid from pg_roles where rolname = current_user) loop
         execute format('alter type %I.%I owner to %I', ${pg.escapeLiteral(schema)}, item.typname, ${pg.escapeLiteral(role)});
       end loop;
       for item in select p.oid::regprocedure as signature from pg_proc p join pg_namespace n on n.oid = p.pronamespace
                   where n.nspname = ${pg.escapeLiteral(schema)} and p.proowner = (select oid from pg_roles where rolname = current_user) loop
         execute format('alter routine %s owner to %I', item.signature, ${pg.escapeLiteral(role)});
       end loop;
     end $$`,
  );
}

/**
 * As the owner, after the migrations: what the app role may do with the product's tables. Rows only; the
 * signing keys are read-only to it, and signed reports are guarded further by the trigger.
 */
export async function grantAppRole(ownerUrl: string, appRole: string) {
  const client = new pg.Client({ connectionString: ownerUrl });
  await client.connect();
  try {
    const role = identifier(appRole);
    const { rows } = await client.query<{ database: string; owns: boolean }>(
      `select current_database() as database, (select datdba from pg_database where datname = current_database()) = (select oid from pg_roles where rolname = current_user) as owns`,
    );
    // The job queue's schemas are the app's own (see ensureLocalRoles); a managed database may grant this itself.
    if (rows[0]?.owns) await client.query(`grant connect, create, temporary on database ${identifier(rows[0].database)} to ${role}`);
    await client.query(`grant usage on schema public to ${role}`);
    await client.query(`grant select, insert, update, delete on all tables in schema public to ${role}`);
    await client.query(`grant usage, select on all sequences in schema public to ${role}`);
    await client.query(`revoke truncate, references, trigger on all tables in schema public from ${role}`);
    await client.query(`revoke insert, update, delete on report_signing_keys from ${role}`);
    await client.query(`revoke delete on reports from ${role}`);
  } finally {
    await client.end();
  }
}

/** The user name in a postgres:// URL. */
export function roleOf(databaseUrl: string) {
  return decodeURIComponent(new URL(databaseUrl).username);
}
