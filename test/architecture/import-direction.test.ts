// The import direction DEVELOPERS.md ("Folders") states, checked on the
// resolved paths of every import in src/ (static, re-export and dynamic), so
// a path the ESLint patterns might miss (an odd number of `../`, an index
// import) is still caught. eslint.config.js states the same rule for the
// editor; the last test checks that ESLint really reports a breach.
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '../..');
const SRC = join(ROOT, 'src');

/** Top-level folders of src/ each folder may not import. */
const FORBIDDEN: Record<string, readonly string[]> = {
  core: ['state', 'ui', 'worker', 'cli'],
  state: ['ui'],
  worker: ['ui', 'cli'],
};

/** What src/worker may take from src/state: the display caps only (plain numbers), so it ranks the rows the page shows. */
const WORKER_FROM_STATE = new Set(['display-caps.ts']);

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...sourceFiles(path));
    else if (/\.(ts|tsx|js|mjs)$/.test(name) && !name.endsWith('.d.ts')) out.push(path);
  }
  return out;
}

const SPECIFIER = /(?:\bfrom\s*|\bimport\s*\(\s*|\bimport\s+)['"]([^'"]+)['"]/g;

/** Every module specifier in a source text (comments stripped first). */
function specifiers(text: string): string[] {
  const code = text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"])\/\/.*$/gm, '$1');
  return [...code.matchAll(SPECIFIER)].map((m) => m[1]!);
}

/** The top-level src/ folder a specifier from `file` lands in, or null for packages. */
function targetFolder(file: string, spec: string): string | null {
  if (!spec.startsWith('.')) return null;
  const rel = relative(SRC, resolve(dirname(file), spec));
  if (rel.startsWith('..')) return null;
  return rel.split(sep)[0] ?? null;
}

describe('import direction', () => {
  it('finds the specifiers of static, re-export, side-effect and dynamic imports', () => {
    const text = [
      "import { a } from '../state/store';",
      "export { b } from '../ui/format';",
      "import './side-effect';",
      "const w = await import('../worker/bridge');",
      "// import { c } from '../ui/ignored';",
    ].join('\n');
    expect(specifiers(text)).toEqual(['../state/store', '../ui/format', './side-effect', '../worker/bridge']);
  });

  const files = sourceFiles(SRC);
  it('scans the whole source tree', () => {
    expect(files.filter((f) => relative(SRC, f).startsWith(`core${sep}`)).length).toBeGreaterThan(50);
    expect(files.filter((f) => relative(SRC, f).startsWith(`state${sep}`)).length).toBeGreaterThan(3);
  });

  for (const [from, banned] of Object.entries(FORBIDDEN)) {
    it(`src/${from} imports none of ${banned.map((b) => `src/${b}`).join(', ')}`, () => {
      const breaches: string[] = [];
      for (const file of files) {
        if (relative(SRC, file).split(sep)[0] !== from) continue;
        for (const spec of specifiers(readFileSync(file, 'utf8'))) {
          const target = targetFolder(file, spec);
          if (target !== null && banned.includes(target)) breaches.push(`${relative(ROOT, file)} → ${spec}`);
        }
      }
      expect(breaches).toEqual([]);
    });
  }

  it('src/worker takes from src/state only the display caps (DEVELOPERS.md, "Folders")', () => {
    const breaches: string[] = [];
    for (const file of files) {
      if (relative(SRC, file).split(sep)[0] !== 'worker') continue;
      for (const spec of specifiers(readFileSync(file, 'utf8'))) {
        if (targetFolder(file, spec) !== 'state') continue;
        const target = relative(join(SRC, 'state'), resolve(dirname(file), spec));
        if (!WORKER_FROM_STATE.has(target)) breaches.push(`${relative(ROOT, file)} → ${spec}`);
      }
    }
    expect(breaches).toEqual([]);
  });

  it('a processing step imports no sibling step: what steps share lives in steps/checks.ts (DEVELOPERS.md, "Folders")', () => {
    const STEPS = join(SRC, 'core', 'steps');
    const shared = new Set(['checks.ts', 'types.ts']);
    const breaches: string[] = [];
    for (const file of sourceFiles(STEPS)) {
      if (file.endsWith(`${sep}registry.ts`)) continue;
      for (const spec of specifiers(readFileSync(file, 'utf8'))) {
        const target = resolve(dirname(file), spec);
        if (spec.startsWith('.') && dirname(target) === STEPS && !shared.has(relative(STEPS, target))) breaches.push(`${relative(ROOT, file)} → ${spec}`);
      }
    }
    expect(breaches).toEqual([]);
  });

  it('ESLint reports a breach in src/core and in src/state', async () => {
    const eslint = new ESLint({ cwd: ROOT });
    const core = await eslint.lintText("import { useStore } from '../state/store';\nexport const s = useStore;\n", {
      filePath: join(SRC, 'core', 'breach-example.ts'),
    });
    const state = await eslint.lintText("import { fmt } from '../ui/format';\nexport const f = fmt;\n", {
      filePath: join(SRC, 'state', 'breach-example.ts'),
    });
    const coreWorker = await eslint.lintText("import { x } from '../../worker';\nexport const y = x;\n", {
      filePath: join(SRC, 'core', 'io', 'breach-example.ts'),
    });
    for (const result of [core, state, coreWorker]) {
      expect(result[0]!.messages.map((m) => m.ruleId)).toContain('no-restricted-imports');
    }
  }, 60_000);
});
