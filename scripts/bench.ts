/**
 * `npm run bench`: runs every module in bench/*.ts in name order. Each module
 * exports `async function run(): Promise<void>` that prints its own figures.
 */
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

async function main(): Promise<void> {
  const dir = path.resolve(__dirname, '..', 'bench');
  const files = readdirSync(dir)
    .filter((f) => f.endsWith('.ts') && !f.endsWith('.d.ts'))
    .sort();
  for (const file of files) {
    const mod = (await import(pathToFileURL(path.join(dir, file)).href)) as { run?: () => Promise<void> };
    if (typeof mod.run !== 'function') {
      console.log(`bench/${file}: no run() export, skipped`);
      continue;
    }
    console.log(`\n== bench/${file}`);
    await mod.run();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
