/**
 * A small JSON Schema (draft 2020-12) checker for the keywords the summary
 * schema uses: type (one or a list, "integer" included), const, enum,
 * required, properties, items, pattern, minimum. Written for the tests;
 * keywords it does not know make it fail rather than pass silently.
 *
 * `strict` also refuses members a "properties" list does not name, so a test
 * notices a field added without being documented (readers of the published
 * schema may see added fields; see the schema's description).
 */
type Schema = Record<string, unknown>;

const KNOWN = new Set(['$schema', '$id', 'title', 'description', 'type', 'const', 'enum', 'required', 'properties', 'items', 'pattern', 'minimum']);

function typeOf(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'array';
  if (typeof v === 'number') return Number.isInteger(v) ? 'integer' : 'number';
  return typeof v;
}

function typeMatches(v: unknown, want: string): boolean {
  const t = typeOf(v);
  return t === want || (want === 'number' && t === 'integer');
}

/** Every place where `value` breaks `schema`, as "path: problem"; empty when it conforms. */
export function schemaProblems(schema: Schema, value: unknown, strict = false, path = '$'): string[] {
  const out: string[] = [];
  for (const k of Object.keys(schema)) if (!KNOWN.has(k)) out.push(`${path}: the checker does not know the keyword "${k}"`);
  if (schema.type !== undefined) {
    const types = Array.isArray(schema.type) ? (schema.type as string[]) : [schema.type as string];
    if (!types.some((t) => typeMatches(value, t))) return [...out, `${path}: expected ${types.join(' or ')}, got ${typeOf(value)}`];
  }
  if ('const' in schema && !Object.is(schema.const, value)) out.push(`${path}: expected ${JSON.stringify(schema.const)}, got ${JSON.stringify(value)}`);
  if (schema.enum !== undefined && !(schema.enum as unknown[]).some((e) => Object.is(e, value))) out.push(`${path}: ${JSON.stringify(value)} is not one of ${JSON.stringify(schema.enum)}`);
  if (typeof schema.pattern === 'string' && typeof value === 'string' && !new RegExp(schema.pattern, 'u').test(value)) out.push(`${path}: "${value}" does not match ${schema.pattern}`);
  if (typeof schema.minimum === 'number' && typeof value === 'number' && value < schema.minimum) out.push(`${path}: ${value} is below ${schema.minimum}`);
  if (typeOf(value) === 'object') {
    const obj = value as Record<string, unknown>;
    for (const r of (schema.required as string[] | undefined) ?? []) if (!(r in obj)) out.push(`${path}: "${r}" is missing`);
    const props = (schema.properties as Record<string, Schema> | undefined) ?? {};
    for (const [k, v] of Object.entries(obj)) {
      if (props[k]) out.push(...schemaProblems(props[k], v, strict, `${path}.${k}`));
      else if (strict && schema.properties) out.push(`${path}: "${k}" is not in the schema`);
    }
  }
  if (Array.isArray(value) && schema.items) value.forEach((v, i) => out.push(...schemaProblems(schema.items as Schema, v, strict, `${path}[${i}]`)));
  return out;
}
