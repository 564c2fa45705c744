import { spawnSync } from 'node:child_process';
import { staleReason } from './inputs.mjs';

// Build the basemap (tiles/dist) when it is missing or out of date; do nothing otherwise.
const reason = staleReason();
if (reason) {
  console.log(`Kfield tiles: building the basemap (${reason})`);
  const r = spawnSync('npm', ['run', '--silent', 'tiles'], { stdio: 'inherit' });
  if (r.status !== 0) {
    console.error('Kfield tiles: the basemap build failed; see the messages above');
    process.exit(r.status ?? 1);
  }
}
