/** Percentiles (nearest rank) of a list of numbers, in the list's unit, rounded to 0.1. */
export function summarize(values) {
  if (!values.length) return { n: 0, p50: null, p95: null, p99: null, max: null, mean: null };
  const a = Float64Array.from(values).sort();
  const at = (q) => a[Math.min(a.length - 1, Math.max(0, Math.ceil(q * a.length) - 1))];
  const r = (v) => Math.round(v * 10) / 10;
  let sum = 0;
  for (const v of a) sum += v;
  return { n: a.length, p50: r(at(0.5)), p95: r(at(0.95)), p99: r(at(0.99)), max: r(a[a.length - 1]), mean: r(sum / a.length) };
}
