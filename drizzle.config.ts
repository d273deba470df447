import { defineConfig } from 'drizzle-kit'

// The scripts set DATABASE_URL to the private cluster they started (scripts/lib.sh).
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/database/schema.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/trapline' },
})
