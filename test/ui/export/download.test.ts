import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { downloadBlob, downloadCsv, downloadText } from '../../../src/ui/export/download.ts';

// src/ui/export/download.ts: a Blob, an object URL and an <a download>,
// with a stand-in document (no browser) that records what was clicked.
interface Anchor { href: string; download: string; rel: string; style: { display: string }; clicked: number; removed: boolean; click(): void; remove(): void }
let anchors: Anchor[];
let blobs: Blob[];
let revoked: string[];

beforeEach(() => {
  anchors = []; blobs = []; revoked = [];
  vi.useFakeTimers();
  vi.stubGlobal('document', {
    createElement: (tag: string) => {
      expect(tag).toBe('a');
      const a: Anchor = { href: '', download: '', rel: '', style: { display: '' }, clicked: 0, removed: false, click() { this.clicked++; }, remove() { this.removed = true; } };
      anchors.push(a);
      return a;
    },
    body: { appendChild: (a: Anchor) => a },
  });
  vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => { blobs.push(b as Blob); return `blob:test/${blobs.length}`; });
  vi.spyOn(URL, 'revokeObjectURL').mockImplementation((u) => { revoked.push(u); });
});
afterEach(() => { vi.useRealTimers(); vi.unstubAllGlobals(); vi.restoreAllMocks(); });

describe('download', () => {
  it('offers the file under the name given, clicks once and tidies the link away', () => {
    downloadBlob('abc', 'peaks.csv', 'text/csv');
    expect(anchors).toHaveLength(1);
    expect(anchors[0]).toMatchObject({ href: 'blob:test/1', download: 'peaks.csv', rel: 'noopener', clicked: 1, removed: true });
    expect(anchors[0].style.display).toBe('none');
    expect(blobs[0].type).toBe('text/csv');
  });
  it('revokes the object URL only after a minute (revoking at once can cancel the download)', () => {
    downloadText('x', 'a.txt');
    vi.advanceTimersByTime(59_999);
    expect(revoked).toEqual([]);
    vi.advanceTimersByTime(1);
    expect(revoked).toEqual(['blob:test/1']);
  });
  it('CSV: UTF-8 with a byte order mark first, so σ and µ survive a spreadsheet; the text after it unchanged', async () => {
    downloadCsv('x,σ\n1,2\n', 'table.csv');
    const bytes = new Uint8Array(await blobs[0].arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]); // U+FEFF in UTF-8 (Unicode Standard, §23.8)
    expect(new TextDecoder('utf-8', { ignoreBOM: false }).decode(bytes)).toBe('x,σ\n1,2\n');
    expect(blobs[0].type).toBe('text/csv;charset=utf-8');
  });
  it('text: no byte order mark, plain text type unless told', async () => {
    downloadText('{"a":1}', 's.json', 'application/json');
    downloadText('hello', 'r.txt');
    expect(await blobs[0].text()).toBe('{"a":1}');
    expect(blobs[0].type).toBe('application/json');
    expect(new Uint8Array(await blobs[1].arrayBuffer())[0]).toBe(0x68);
    expect(blobs[1].type).toBe('text/plain;charset=utf-8');
  });
});
