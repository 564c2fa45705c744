import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

// Runs every tests/bench/*.bench.ts in name order; each exports `run(): Promise<void>`.
// `npm run bench -- viewers map` runs only the benches whose file names contain one of the words.
const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => !only.length || only.some((w) => f.includes(w)))
  .sort();
if (!files.length) throw new Error(`no bench matches ${only.join(', ')}`);

for (const file of files) {
  const mod = (await import(pathToFileURL(join(here, file)).href)) as { run?: () => Promise<void> };
  if (typeof mod.run !== 'function') throw new Error(`${file} does not export run()`);
  console.log(`\n# ${file}`);
  await mod.run();
}
