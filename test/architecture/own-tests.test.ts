// Issue 19: test/ mirrors src/ folder for folder, and every module has its own
// test file (test/<same folders>/<module>.test.ts or .tsx). A module without
// one must be named below with the reason; a new module without a test file,
// or an exemption that is no longer needed, fails this test.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '../..');
const SRC = join(ROOT, 'src');

/** Modules with no own test file on purpose, each with its reason. */
const EXEMPT: Record<string, string> = {
  'main.tsx': 'the entry point: no exports; it mounts the page, which every Playwright spec loads',
  'core/steps/types.ts': 'types only: no runtime code',
  'worker/api.ts': 'types only: the worker\'s method map, checked by the compiler at every call',
};

function modules(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...modules(path));
    else if (/\.(ts|tsx)$/.test(name) && !name.endsWith('.d.ts')) out.push(relative(SRC, path));
  }
  return out.sort();
}

/** The test file a module should have: the same folders under test/, `<module>.test.ts` or `.tsx`. */
function ownTest(module: string): string | null {
  const stem = module.replace(/\.(ts|tsx)$/, '');
  for (const ext of ['.test.ts', '.test.tsx']) {
    const p = join(ROOT, 'test', stem + ext);
    if (existsSync(p)) return p;
  }
  return null;
}

describe('every module under src/ has its own test file', () => {
  const all = modules(SRC);

  it('finds the source tree (a wrong root would make the next checks pass on nothing)', () => {
    expect(all.length).toBeGreaterThan(150);
    expect(all).toContain('core/steps/moving-average.ts');
  });

  it('every module not on the exemption list has test/<same path>.test.ts(x)', () => {
    const missing = all.filter((m) => !(m in EXEMPT) && ownTest(m) === null);
    expect(missing).toEqual([]);
  });

  it('every exemption names a module that exists and still has no own test file', () => {
    const stale = Object.keys(EXEMPT).filter((m) => !all.includes(m) || ownTest(m) !== null);
    expect(stale).toEqual([]);
  });
});
