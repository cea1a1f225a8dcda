/** Numbers for tables: enough digits to read, never more than the data supports. */
export function num(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined) return '—';
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  if (a !== 0 && (a < 1e-3 || a >= 1e6)) return v.toExponential(digits - 1);
  return String(Number(v.toPrecision(digits)));
}
