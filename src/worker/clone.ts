/** Deep copy of the typed arrays in a result (all kinds: σ profiles hold Int32Array) so the originals can stay cached in the worker. */
export function cloneResultForTransfer<T>(value: T, depth = 0): T {
  if (value === null || typeof value !== 'object' || depth > 8) return value;
  // Every typed array is copied: whatever is transferred afterwards must not be an array the worker keeps.
  if (ArrayBuffer.isView(value)) return (value instanceof DataView ? value : (value as unknown as Float64Array).slice()) as unknown as T;
  if (Array.isArray(value)) return value.map((v) => cloneResultForTransfer(v, depth + 1)) as unknown as T;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value as Record<string, unknown>)) out[k] = cloneResultForTransfer(v, depth + 1);
  return out as T;
}
