/** Deep copy of the typed arrays in a result so the originals can stay cached in the worker. */
export function cloneResultForTransfer<T>(value: T, depth = 0): T {
  if (value === null || typeof value !== 'object' || depth > 8) return value;
  if (value instanceof Float64Array) return value.slice() as unknown as T;
  if (ArrayBuffer.isView(value)) return value;
  if (Array.isArray(value)) return value.map((v) => cloneResultForTransfer(v, depth + 1)) as unknown as T;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value as Record<string, unknown>)) out[k] = cloneResultForTransfer(v, depth + 1);
  return out as T;
}
