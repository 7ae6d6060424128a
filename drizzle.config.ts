import { defineConfig } from 'drizzle-kit';

// Used only by `npm run db:generate` (migrations are applied by the server at start).
export default defineConfig({
  dialect: 'postgresql',
  driver: 'pglite',
  schema: './server/db/schema.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.PGLITE_DIR ?? './data/pglite' },
});
