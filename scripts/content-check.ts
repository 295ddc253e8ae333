// `npm run content:check`: validates Beadpath's demo content in content/ without a database: every
// guide with the guide validator, every article and its links, the drawings and the scenario.
// Exits 1 on any error; warnings are printed and do not fail.
import { checkContent, readContent } from '../content/lib/content';

const verbose = process.argv.includes('--verbose');
const report = checkContent(readContent());
if (verbose) for (const line of report.summary) console.log(line);
for (const w of report.warnings) console.log(`warning: ${w}`);
for (const e of report.errors) console.error(`error: ${e}`);
const guides = report.summary.filter((l) => l.startsWith('guide')).length;
const articles = report.summary.filter((l) => l.startsWith('article')).length;
console.log(`content:check: ${guides} guides, ${articles} articles, ${report.errors.length} errors, ${report.warnings.length} warnings`);
process.exitCode = report.errors.length ? 1 : 0;
