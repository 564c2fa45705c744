import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

// Runs every tests/bench/*.bench.ts in name order; each exports `run(): Promise<void>`.
const here = dirname(fileURLToPath(import.meta.url));
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .sort();

for (const file of files) {
  const mod = (await import(pathToFileURL(join(here, file)).href)) as { run?: () => Promise<void> };
  if (typeof mod.run !== 'function') throw new Error(`${file} does not export run()`);
  console.log(`\n# ${file}`);
  await mod.run();
}
