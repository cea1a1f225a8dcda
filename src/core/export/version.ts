/**
 * The tool's name, version and the caution every export carries. The
 * version is kept equal to package.json's by a test (test/core/export/version.test.ts),
 * so the pure layer needs no JSON import or build-time define.
 */

export const TOOL_NAME = 'Tracewright';

/** Same as "version" in package.json. */
export const TOOL_VERSION = '0.1.0';

/** Name and version as written into exports, e.g. "Tracewright 0.1.0". */
export const TOOL_LABEL = `${TOOL_NAME} ${TOOL_VERSION}`;

/** The sentence every exported file carries, word for word. */
export const CAUTION =
  "This is not a validated system; the laboratory's own procedures, validated methods and regulators' requirements govern.";

/**
 * ISO 8601 time of an export in UTC, e.g. "2025-03-04T10:20:30.000Z".
 * @throws RangeError when `now` is not a valid date.
 */
export function exportTime(now: Date): string {
  if (!(now instanceof Date) || Number.isNaN(now.getTime())) throw new RangeError('The export time must be a valid date.');
  return now.toISOString();
}
