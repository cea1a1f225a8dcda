/**
 * Shared checks of the calibration's versioned JSON sub-objects (named-peak
 * table, standards, settings): a plain object with the right "format" and a
 * "version" this code can read.
 */

/** A JSON object (not null, not an array). */
export function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/**
 * Check "format" and "version". A version newer than `maxVersion` is the
 * one problem that stops everything else ("open it with a newer version").
 * @param what the object in words, e.g. "named-peak table"
 */
export function checkFormatAndVersion(
  value: unknown, format: string, maxVersion: number, what: string,
): { ok: true; value: Record<string, unknown>; problems: string[] } | { ok: false; problems: string[] } {
  if (!isPlainObject(value)) return { ok: false, problems: [`The ${what} is not a JSON object.`] };
  const problems: string[] = [];
  if (value.format !== format) problems.push(`"format" must be "${format}".`);
  const version = value.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) problems.push('"version" must be a whole number.');
  else if (version > maxVersion) {
    return { ok: false, problems: [`The ${what} was written by a newer version of Tracewright (version ${version}; this one reads up to ${maxVersion}). Open it with a newer version.`] };
  }
  return { ok: true, value, problems };
}
