import { defineConfig } from 'drizzle-kit';

// `npm run db:generate` writes a new migration into packages/db/migrations from the schema.
// Migrations are committed and applied by the product at start (packages/db/src/migrate.ts).
export default defineConfig({
  dialect: 'mysql',
  schema: './packages/db/src/schema.ts',
  out: './packages/db/migrations',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'mysql://root@127.0.0.1:3306/turnstone' },
});
