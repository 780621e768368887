/** Percentile by nearest rank over a sample of durations (ms). */
export function percentile(samples: number[], p: number): number {
  const sorted = [...samples].sort((a, b) => a - b);
  const rank = Math.max(1, Math.ceil((p / 100) * sorted.length));
  return sorted[rank - 1]!;
}

export function summarize(label: string, samples: number[], target?: { p95?: number; p99?: number }) {
  const p50 = percentile(samples, 50);
  const p95 = percentile(samples, 95);
  const p99 = percentile(samples, 99);
  const verdict =
    target?.p95 !== undefined ? (p95 <= target.p95 ? `meets p95 ≤ ${target.p95} ms` : `MISSES p95 ≤ ${target.p95} ms`) : '';
  console.log(`${label}: n=${samples.length} p50=${p50.toFixed(2)} ms p95=${p95.toFixed(2)} ms p99=${p99.toFixed(2)} ms ${verdict}`);
  return { p50, p95, p99 };
}
