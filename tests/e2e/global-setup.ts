import fs from 'node:fs';

/** Browser tests need Debian's chromium and the built client; say how to get either rather than skip. */
export default function setup() {
  const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  if (!fs.existsSync(chromium)) {
    throw new Error(
      `Browser tests need Debian's chromium at ${chromium}. Install it with: sudo apt-get install -y chromium (or set CHROMIUM_PATH).`,
    );
  }
  if (!fs.existsSync('dist/client/index.html')) {
    throw new Error('Browser tests run against the built client: run `npm run build` first (npm test does it for you).');
  }
}
