#!/usr/bin/env node
// `npm run bench -- NAME [...]`: runs the benchmark module src/bench/NAME.ts, which prints one
// JSON line per scenario on standard output.
const names = process.argv.slice(2);
if (names.length === 0) {
  console.error('usage: npm run bench -- NAME [NAME ...]   (e.g. forward, samplers, likelihood)');
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
  await module.run(process.argv.slice(3));
}
