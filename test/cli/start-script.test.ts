import { describe, expect, it } from 'vitest';
// @ts-expect-error a plain ES module script without types
import { whyNoBrowser } from '../../scripts/start.mjs';

// Issue 17: npm start opens a browser only where one can be opened.
describe('npm start: whether to open a browser', () => {
  const has = () => true, hasNot = () => false;
  it('opens on a desktop', () => {
    expect(whyNoBrowser({ DISPLAY: ':0' }, 'linux', has)).toBeNull();
    expect(whyNoBrowser({}, 'darwin', hasNot)).toBeNull();
  });
  it('says why not without a desktop, without an opener, or when asked not to', () => {
    expect(whyNoBrowser({}, 'linux', has)).toMatch(/no desktop/);
    expect(whyNoBrowser({ DISPLAY: ':0' }, 'linux', hasNot)).toMatch(/xdg-open/);
    expect(whyNoBrowser({ BROWSER: 'none', DISPLAY: ':0' }, 'linux', has)).toMatch(/BROWSER=none/);
  });
});
