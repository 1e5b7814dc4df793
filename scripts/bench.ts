// Usage: npx tsx scripts/bench.ts [filter] — prints `BENCH <name> <value> <unit> ratio=<r>` lines.
import { formatLine, selects } from './bench/harness';
import { modules } from './bench/index';

const filter = process.argv[2];
let failed = false;
for (const module of modules) {
	if (!selects(filter, module)) continue;
	const reason = (await module.skip?.()) ?? null;
	if (reason !== null) {
		console.error(`skip ${module.name}: ${reason}`);
		continue;
	}
	try {
		const wholeModule = filter === undefined || module.name.includes(filter);
		for (const line of await module.run(wholeModule ? {} : { filter })) console.log(formatLine(line));
	} catch (err) {
		failed = true;
		console.error(`bench ${module.name} failed:`, err);
	}
}
if (failed) process.exitCode = 1;
