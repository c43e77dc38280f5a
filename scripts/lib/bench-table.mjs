// Merges the rows each benchmark wrote into one table on stdout and one JSON file. A run of some suites only
// (HB_ONLY) keeps the rows OUT.json already held for the others, each with the time it was measured.
// Usage: node bench-table.mjs OUT.json suite=rows.json...
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';

const [outFile, ...inputs] = process.argv.slice(2);
const measuredAt = new Date().toISOString();
const rows = [];
for (const input of inputs) {
  const at = input.indexOf('=');
  const suite = input.slice(0, at);
  const file = input.slice(at + 1);
  if (!existsSync(file)) {
    console.log(`(${suite}: wrote no rows to BENCH_RESULTS_FILE)`);
    continue;
  }
  const parsed = JSON.parse(readFileSync(file, 'utf8'));
  for (const row of Array.isArray(parsed) ? parsed : [parsed]) {
    if (row && typeof row === 'object') rows.push({ suite, ...row, measuredAt });
  }
}

// The machine is shared, so the load around the run says how far to trust it.
const machine = {
  cores: cpus().length,
  loadAverageAtStart: process.env.BENCH_LOAD_START ?? null,
  loadAverageAtEnd: loadavg().map((n) => n.toFixed(2)).join(' '),
};
const runSuites = new Set(inputs.map((input) => input.slice(0, input.indexOf('='))));
const earlier = existsSync(outFile) ? JSON.parse(readFileSync(outFile, 'utf8')) : { rows: [] };
const kept = (earlier.rows ?? [])
  .filter((row) => !runSuites.has(row.suite))
  .map((row) => ({ ...row, measuredAt: row.measuredAt ?? earlier.date ?? null }));
writeFileSync(outFile, `${JSON.stringify({ date: measuredAt, node: process.version, machine, rows: [...rows, ...kept] }, null, 2)}\n`);
if (kept.length) {
  const suites = [...new Set(kept.map((row) => `${row.suite} (${row.measuredAt ?? 'an earlier run'})`))];
  console.log(`kept ${kept.length} rows of suites not run this time: ${suites.join(', ')}`);
}
if (rows.length === 0) process.exit(0);

// The usual columns first, in reading order; any other a benchmark writes follows.
const preferred = ['suite', 'figure', 'hodboard', 'floor', 'ratio', 'target', 'met'];
const seen = new Set(rows.flatMap((r) => Object.keys(r)).filter((key) => key !== 'measuredAt'));
const columns = [...preferred.filter((c) => seen.has(c)), ...[...seen].filter((c) => !preferred.includes(c))];
const cell = (value) => {
  if (value === undefined || value === null) return '';
  if (typeof value === 'number') {
    if (Number.isInteger(value)) return String(value);
    const size = Math.abs(value);
    return size >= 1000 ? value.toFixed(0) : size >= 1 ? value.toFixed(2) : value.toPrecision(3);
  }
  return String(value);
};
const table = rows.map((r) => columns.map((c) => cell(r[c])));
const widths = columns.map((c, i) => Math.max(c.length, ...table.map((t) => t[i].length)));
const numeric = columns.map((c) => rows.every((r) => r[c] === undefined || r[c] === null || typeof r[c] === 'number'));
const line = (cells) =>
  cells.map((v, i) => (numeric[i] ? v.padStart(widths[i]) : v.padEnd(widths[i]))).join('  ').trimEnd();
console.log(line(columns));
console.log(widths.map((w) => '-'.repeat(w)).join('  '));
for (const t of table) console.log(line(t));
console.log(`\n${rows.length} rows; written to ${outFile}`);
console.log(`machine: ${machine.cores} cores, node ${process.version}, load average ${machine.loadAverageAtStart ?? '?'} at the start, ${machine.loadAverageAtEnd} at the end`);
