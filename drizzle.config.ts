import { defineConfig } from 'drizzle-kit';

// `npm run db:generate` writes a new migration into drizzle/ from src/db/schema/ (index.ts re-exports every domain file).
// Commit it; it is applied at start (src/db/migrate.ts). Never `drizzle-kit push`.
export default defineConfig({
  dialect: 'sqlite',
  schema: './src/db/schema/index.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.DATABASE_PATH ?? 'data/paredown.sqlite' },
});
