import { cpus } from 'node:os';
import * as appBench from './app-bench.ts';
import * as coreBench from './core-bench.ts';
import * as handoverBench from './handover-bench.ts';
import * as serverBench from './server-bench.ts';
import * as unitViewBench from './unit-view-bench.ts';

/** A bench module prints its own figures, each against a baseline measured in the same run. */
interface BenchModule {
  name: string;
  run: () => Promise<void>;
}

// Add each new bench module to this list (import it above); it exports `async function run(): Promise<void>`.
const benchModules: BenchModule[] = [
  { name: 'core', run: coreBench.run },
  { name: 'handover', run: handoverBench.run },
  { name: 'server', run: serverBench.run },
  { name: 'app', run: appBench.run },
  { name: 'unit-view', run: unitViewBench.run },
];

// `npm run bench -- core` runs only the named modules.
const wanted = process.argv.slice(2);
const unknown = wanted.filter((name) => !benchModules.some((m) => m.name === name));
if (unknown.length > 0) {
  console.error(`unknown bench module(s): ${unknown.join(', ')}; known: ${benchModules.map((m) => m.name).join(', ')}`);
  process.exit(2);
}

console.log(`Rhythm Ledger bench: Node ${process.version}, ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown CPU'})`);
for (const module of benchModules) {
  if (wanted.length > 0 && !wanted.includes(module.name)) continue;
  console.log('');
  const started = performance.now();
  try {
    await module.run();
    console.log(`  (${module.name} bench took ${((performance.now() - started) / 1000).toFixed(1)} s)`);
  } catch (error) {
    console.error(`bench ${module.name} failed: ${(error as Error).stack ?? String(error)}`);
    process.exitCode = 1;
  }
}
