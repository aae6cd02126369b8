// `npm run bench`: runs every bench/*.bench.mjs in turn and prints their ratios. Speed targets are
// ratios measured in one run on one machine, never timed assertions in tests.
import { readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

const only = process.argv.slice(2);
const files = readdirSync('bench').filter((f) => f.endsWith('.bench.mjs') && (only.length === 0 || only.some((o) => f.includes(o)))).sort();
let failed = 0;
for (const f of files) {
  console.log(`\n== ${f}`);
  const r = spawnSync(process.execPath, ['--expose-gc', join('bench', f)], { stdio: 'inherit' });
  if (r.status !== 0) failed++;
}
process.exitCode = failed ? 1 : 0;
