// The newest modification time under a folder, ms: the build stamps dist/ with it, and
// bin/footing.js runs dist/ only while no source file is newer (a few ms for harness/).
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

export function newest(folder) {
  let latest = 0;
  for (const entry of readdirSync(folder, { withFileTypes: true })) {
    const path = join(folder, entry.name);
    latest = Math.max(latest, entry.isDirectory() ? newest(path) : statSync(path).mtimeMs);
  }
  return latest;
}
