#!/usr/bin/env node
// `npm run bench -- NAME [...] [--option value ...]`: runs the benchmark module src/bench/NAME.ts,
// which prints one JSON line per scenario on standard output; arguments from the first `--option`
// on go to every module named.
const all = process.argv.slice(2);
const firstOption = all.findIndex((a) => a.startsWith('--'));
const names = firstOption < 0 ? all : all.slice(0, firstOption);
const options = firstOption < 0 ? [] : all.slice(firstOption);
if (names.length === 0) {
  console.error('usage: npm run bench -- NAME [NAME ...] [--option value ...]   (forward, likelihood, compare, samplers, evidence, vet, verdict, nestedRun, sparseCholesky, triangulation, pixelSource, pixelRecovery, pixelMassProfile, pixelMeshChoice)');
  process.exit(2);
}
for (const name of names) {
  if (!/^[a-z][a-zA-Z0-9]*$/.test(name)) {
    console.error(`bench: no benchmark named ${JSON.stringify(name)}`);
    process.exit(2);
  }
  let module: { run: (args: string[]) => Promise<void> };
  try {
    module = await import(`./${name}.js`);
  } catch (error) {
    console.error(`bench: no benchmark named ${JSON.stringify(name)} (${(error as Error).message})`);
    process.exit(2);
  }
  await module.run(options);
}
