// One autocannon run in its own process, so the load and the server under test do not share an event loop.
// Usage: node load-driver.mjs '{"url":…,"headers":{…},"connections":10,"seconds":30,"warmupSeconds":3}'
// Prints one JSON line: req/s, latency quantiles of the 2xx answers (every one recorded, not a histogram
// bucket), and the counts of errors and non-2xx answers.
import autocannon from 'autocannon';

const { url, headers = {}, connections = 10, seconds = 30, warmupSeconds = 3 } = JSON.parse(process.argv[2] ?? '{}');
if (!url) throw new Error('usage: load-driver.mjs JSON with url');

function run(duration, latencies) {
  return new Promise((resolve, reject) => {
    const instance = autocannon({ url, headers, connections, duration, pipelining: 1, timeout: 10 }, (error, result) => (error ? reject(error) : resolve(result)));
    if (latencies) {
      instance.on('response', (_client, statusCode, _bytes, responseTime) => {
        if (statusCode >= 200 && statusCode < 300) latencies.push(responseTime);
      });
    }
  });
}

const quantile = (sorted, q) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? null;

if (warmupSeconds > 0) await run(warmupSeconds);
const latencies = [];
const result = await run(seconds, latencies);
latencies.sort((a, b) => a - b);
process.stdout.write(`${JSON.stringify({
  requestsPerSecond: result.requests.total / (result.duration || seconds),
  requests: result.requests.total,
  non2xx: result.non2xx,
  errors: result.errors + result.timeouts,
  p50: quantile(latencies, 0.5),
  p95: quantile(latencies, 0.95),
  p99: quantile(latencies, 0.99),
  bytesPerResponse: result.requests.total ? result.throughput.total / result.requests.total : 0,
})}\n`);
