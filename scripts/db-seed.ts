// Seeds the invented demo workspace once; a second run leaves existing data alone.
import { createKnex } from '../lib/db/connection';
import { seedDemo, DEMO_PASSWORD } from '../db/seeds/demo';

async function main() {
  const k = createKnex();
  try {
    const { created } = await seedDemo(k);
    console.log(created ? `Demo workspace seeded; demo password for every demo account: ${DEMO_PASSWORD}` : 'Demo workspace already present.');
  } finally {
    await k.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
