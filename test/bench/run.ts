/**
 * `npm run bench`: runs every benchmark module, prints its figures and
 * writes them all to test-results/bench.json (one key per figure). Targets
 * are printed beside the figures; nothing here passes or fails a build.
 *
 * A module exports `run(): Promise<BenchFigures>`; add it to `modules`.
 */
import { mkdirSync, writeFileSync, existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

export type BenchFigures = Record<string, number>;

const here = dirname(fileURLToPath(import.meta.url));
const modules = ['kinematics', 'balance', 'intent', 'study', 'ui', 'queue'];
const only = process.argv.slice(2);

const all: BenchFigures = {};
for (const name of modules) {
  if (only.length && !only.includes(name)) continue;
  if (!existsSync(join(here, `${name}.ts`))) continue;
  console.log(`\n== ${name}`);
  const mod = (await import(`./${name}.js`)) as { run: () => Promise<BenchFigures> };
  const figures = await mod.run();
  for (const [k, v] of Object.entries(figures)) console.log(`  ${k.padEnd(40)} ${v}`);
  Object.assign(all, figures);
}
const out = join(here, '..', '..', 'test-results');
mkdirSync(out, { recursive: true });
const file = join(out, 'bench.json');
// A run of some modules keeps the other modules' last figures.
const previous = only.length && existsSync(file) ? (JSON.parse(readFileSync(file, 'utf8')) as BenchFigures) : {};
writeFileSync(file, JSON.stringify({ ...previous, ...all }, null, 2) + '\n');
console.log(`\nwrote test-results/bench.json (${Object.keys(all).length} figures)`);
