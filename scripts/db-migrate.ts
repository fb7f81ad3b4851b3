// Brings the configured database (SQLite by default, PostgreSQL with DATABASE_URL) up to date.
import { createKnex } from '../lib/db/connection';

async function main() {
  const k = createKnex();
  try {
    const [batch, names] = await k.migrate.latest();
    console.log(names.length ? `Migrated (batch ${batch}): ${names.join(', ')}` : 'Database already up to date.');
  } finally {
    await k.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
