import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildDemoArea } from './demo-area';

/** Regenerate tiles/sources/demo-area.geojson (committed) from demo-area.ts. */
const out = path.join(path.dirname(fileURLToPath(import.meta.url)), 'demo-area.geojson');
const fc = buildDemoArea();
fs.writeFileSync(out, JSON.stringify(fc));
const counts = new Map<string, number>();
for (const f of fc.features) counts.set(String(f.properties?.layer), (counts.get(String(f.properties?.layer)) ?? 0) + 1);
console.log(`wrote ${path.relative(process.cwd(), out)}: ${fc.features.length} features, ${(fs.statSync(out).size / 1024).toFixed(0)} KB`, Object.fromEntries(counts));
