#!/bin/sh
# Runs once, when the database volume is first initialised (postgres image: /docker-entrypoint-initdb.d).
# Creates the two roles Leadline uses and its database; the superuser of this container is used only here.
#   leadline_owner  owns the schema and runs the migrations (LEADLINE_MIGRATION_DATABASE_URL)
#   leadline_app    the service's runtime role: SELECT, and writes only through the record functions, granted by the
#                   migrations (DATABASE_URL); no INSERT on record, identity or rule tables
set -eu
psql -v ON_ERROR_STOP=1 --username "$POSTGRES_USER" --dbname postgres \
  -v owner_password="$LEADLINE_OWNER_PASSWORD" -v app_password="$LEADLINE_APP_PASSWORD" <<'SQL'
CREATE ROLE leadline_owner LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE PASSWORD :'owner_password';
CREATE ROLE leadline_app LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE PASSWORD :'app_password';
CREATE DATABASE leadline OWNER leadline_owner;
REVOKE ALL ON DATABASE leadline FROM PUBLIC;
GRANT CONNECT ON DATABASE leadline TO leadline_app;
SQL
psql -v ON_ERROR_STOP=1 --username "$POSTGRES_USER" --dbname leadline <<'SQL'
REVOKE CREATE ON SCHEMA public FROM PUBLIC;
SQL
