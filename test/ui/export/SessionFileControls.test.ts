import { beforeEach, describe, expect, it, vi } from 'vitest';
import { sessionFromFileText } from '../../../src/state/session-file.ts';
import { service } from '../../../src/state/service.ts';
import { useApp } from '../../../src/state/store.ts';
import { SessionFileControls } from '../../../src/ui/export/SessionFileControls.tsx';
import { demoBytes, elements, press, resetStore, tree } from '../harness.ts';

// src/ui/export/SessionFileControls.tsx: save the session to a file and
// open one; a file that cannot be read changes nothing. The download is
// recorded instead of offered.
const saved: { text: string; name: string; type: string }[] = [];
vi.mock('../../../src/ui/export/download.ts', () => ({ downloadText: (text: string, name: string, type: string) => { saved.push({ text, name, type }); } }));
beforeEach(() => { resetStore(); saved.length = 0; });

const openFile = async (name: string, body: string) => {
  const input = elements(tree(SessionFileControls)).find((e) => e.type === 'input')!;
  const target = { files: [{ name, text: async () => body }], value: 'C:\\fakepath\\x' };
  (input.props.onChange as (e: unknown) => void)({ target });
  await new Promise((r) => setTimeout(r, 20));
  return target;
};

describe('SessionFileControls', () => {
  it('Save writes a JSON session file, named by the time, that reads back to the same traces, roles and sample', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    await service.loadBytes(demoBytes('demo-blank.csv'), 'demo-blank.csv', { roles: ['blank'] });
    press(tree(SessionFileControls), 'Save session to a file');
    expect(saved).toHaveLength(1);
    expect(saved[0].type).toBe('application/json');
    expect(saved[0].name).toMatch(/^tracewright-session-\d{4}-\d\d-\d\dT\d\d-\d\d-\d\dZ\.json$/);
    const back = sessionFromFileText(saved[0].text, saved[0].name);
    if (!back.ok) throw new Error(back.problem);
    const s = useApp.getState();
    expect(back.snapshot.sampleId).toBe(s.sampleId);
    expect(back.snapshot.roles).toEqual(s.roles);
    expect(back.snapshot.traces.map((t) => [t.name, Array.from(t.y)])).toEqual(s.traces.map((t) => [t.name, Array.from(t.y)]));
  });
  it('a file that is not a session: an error naming the file, “Nothing was changed.”, and nothing is', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    const before = useApp.getState().traces;
    const target = await openFile('notes.json', '{"hello": 1}');
    const n = useApp.getState().notices[0];
    expect(n.kind).toBe('error');
    expect(n.title).toBe('The session file was not opened');
    expect(n.lines[0]).toMatch(/^notes\.json: /);
    expect(n.lines).toContain('Nothing was changed.');
    expect(useApp.getState().traces).toBe(before);
    expect(target.value).toBe(''); // the same file can be picked again
  });
  it('into an empty page a good session file opens at once and says what it brought', async () => {
    await service.loadBytes(demoBytes('demo-sample.csv'), 'demo-sample.csv');
    press(tree(SessionFileControls), 'Save session to a file');
    resetStore();
    await openFile('mine.json', saved[0].text);
    const s = useApp.getState();
    expect(s.traces).toHaveLength(1);
    expect(s.notices[0].title).toBe('Session opened from mine.json');
    expect(s.notices[0].lines[0]).toMatch(/^1 trace\(s\), the step stack with 0 undo step\(s\)/);
  });
});
