import { execFileSync } from 'node:child_process';
import { existsSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';

const inputs = ['src', 'shared', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package-lock.json'];
const stamp = path.join('dist', '.build-stamp');

function newestMtime(p: string): number {
  if (!existsSync(p)) return 0;
  const st = statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  return readdirSync(p).reduce((max, name) => Math.max(max, newestMtime(path.join(p, name))), st.mtimeMs);
}

/** Builds the client when the build is missing or older than any of its inputs. */
export function buildClientIfStale(): void {
  const built = existsSync(stamp) ? statSync(stamp).mtimeMs : 0;
  const newest = Math.max(...inputs.map(newestMtime));
  if (built >= newest && existsSync(path.join('dist', 'index.html'))) {
    console.log('[build] client build is up to date');
    return;
  }
  console.log('[build] building the client…');
  execFileSync(process.execPath, [path.join('node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'], { stdio: 'inherit' });
  writeFileSync(stamp, new Date().toISOString());
}
