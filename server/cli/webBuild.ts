import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const SOURCES = [
  'app',
  'components',
  'hooks',
  'shared',
  'fonts',
  'assets',
  'app.json',
  'package.json',
  'babel.config.js',
];

function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0;
  const st = fs.statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let newest = st.mtimeMs;
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

/** True when the exported web build is missing or older than any of its sources. */
export function webBuildIsStale(root: string, webDir: string): boolean {
  const index = path.join(webDir, 'index.html');
  if (!fs.existsSync(index)) return true;
  const built = fs.statSync(index).mtimeMs;
  return SOURCES.some((s) => newestMtime(path.join(root, s)) > built);
}

export function buildWeb(root: string, webDir: string): void {
  console.log('Building the web app (expo export)…');
  const result = spawnSync('npx', ['expo', 'export', '--platform', 'web', '--output-dir', webDir], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, CI: '1', EXPO_NO_TELEMETRY: '1' },
  });
  if (result.status !== 0) throw new Error('The web build failed (see above)');
}
