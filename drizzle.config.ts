import { defineConfig } from 'drizzle-kit';

// `npx drizzle-kit generate` writes SQL migrations into drizzle/ from the
// schema; the server applies them at start (server/db/migrate.ts).
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
  dbCredentials: { url: process.env['DATABASE_URL'] ?? 'postgres://postgres@127.0.0.1:54329/rollwise' },
});
