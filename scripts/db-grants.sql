-- What the app's role (trapline_app) may do in a Trapline database: read and write rows, use the
-- sequences, nothing else. It owns no table, so it cannot alter one, disable its triggers or truncate
-- it; migrations run as the owner. Applied after every migration (idempotent).
revoke create on schema public from public;
grant usage on schema public to trapline_app;
grant select, insert, update, delete on all tables in schema public to trapline_app;
grant usage, select, update on all sequences in schema public to trapline_app;
revoke all on schema drizzle from trapline_app;
