/**
 * `npm run bench`: runs every bench/*.bench.ts (or only those named on the command line,
 * e.g. `npm run bench -- core archive`) one after another and prints a summary table.
 * Benchmarks print figures; they assert nothing (targets live in the issues and docs/).
 */
import { readdir } from 'node:fs/promises';
import { fileURLToPath, pathToFileURL } from 'node:url';
import path from 'node:path';

type BenchModule = { run: () => Promise<Record<string, string | number>> };

const benchDir = path.dirname(fileURLToPath(import.meta.url));
const wanted = process.argv.slice(2);
const files = (await readdir(benchDir))
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => wanted.length === 0 || wanted.includes(f.replace(/\.bench\.ts$/, '')))
  .sort();

const results: Array<[string, Record<string, string | number>]> = [];
let failed = 0;
for (const file of files) {
  const name = file.replace(/\.bench\.ts$/, '');
  console.log(`\n=== ${name} ===`);
  try {
    const mod = (await import(pathToFileURL(path.join(benchDir, file)).href)) as BenchModule;
    results.push([name, await mod.run()]);
  } catch (err) {
    failed += 1;
    console.error(`${name} failed:`, err);
  }
}

console.log('\n=== summary ===');
for (const [name, figures] of results) {
  for (const [key, value] of Object.entries(figures)) console.log(`${name}.${key}: ${value}`);
}
process.exit(failed > 0 ? 1 : 0);
