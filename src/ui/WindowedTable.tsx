import { useEffect, useLayoutEffect, useRef, useState, type ReactNode } from 'react';
import { flushSync } from 'react-dom';
import { DRAW_ALL_UP_TO, FIRST_BOX_ESTIMATE, heightsFromTops, meanHeight, rowHeights, rowWindow, scrollToShow, wholeWindow, type BoxView } from './windowed-rows.ts';

/** What a drawn row puts on its first <tr>: its place among all rows for assistive technology, and its key for measuring. */
export interface RowAttrs { 'aria-rowindex': number; 'data-row-key': string }

export interface WindowedTableProps {
  /** The scrolled box's accessible name (it is a region the keyboard can reach). */
  label: string;
  className: string;
  testId: string;
  /** The caption and the <thead>. */
  head: ReactNode;
  /** Each row's identity in the order shown (never its position: a re-sorted table keeps focus and measured heights with the row). */
  keys: readonly string[];
  /** Columns a spacer row spans. */
  columns: number;
  /** Row i's <tr> (and its detail row, if open), keyed by keys[i]; `attrs` go on its first <tr>. */
  row: (i: number, attrs: RowAttrs) => ReactNode;
  /** aria-rowindex of row i (default i + 2: the header is row 1). */
  rowIndex?: (i: number) => number;
  /** aria-rowcount of the whole table (default one per row plus the header row). */
  rowCount?: number;
  /** Shown in the body when there are no rows. */
  empty?: ReactNode;
  /** A row to bring into the box when it changes (the selected peak), or null. */
  reveal?: number | null;
}

/** The box's scroll offset and height and the sticky header's height (read in a frame callback or after layout, never in render). */
function boxView(wrap: HTMLElement, body: HTMLTableSectionElement): BoxView {
  const head = (body.parentElement as HTMLTableElement | null)?.tHead;
  return { scrollTop: wrap.scrollTop, boxHeight: wrap.clientHeight, headHeight: head ? head.getBoundingClientRect().height : 0 };
}

/** Measured row heights kept at most (a row's key stays while the table holds it; the rest go oldest first). */
const MEASURED_KEPT = 5000;

/** The first row in view: its key and its place in the scrolled content; `due` when a commit is to keep it in place. */
interface Anchor { key: string; at: number; due: boolean }

/**
 * When rows above the first row in view are drawn or measured anew (an
 * estimated height replaced by the real one), the rows in view would move: the
 * box is scrolled by as much instead, before the frame is painted, so no row
 * jumps (with `correct`); then the anchor is taken again. The browser's own
 * scroll anchoring is off for a windowed box (styles.css), so the two never
 * correct twice.
 */
function keepAnchor(wrap: HTMLElement, body: HTMLTableSectionElement, anchor: Anchor, correct: boolean): void {
  const boxTop = wrap.getBoundingClientRect().top;
  const rows = Array.from(body.rows).filter((tr) => tr.dataset.rowKey !== undefined);
  if (correct && anchor.key) {
    const tr = rows.find((r) => r.dataset.rowKey === anchor.key);
    if (tr) {
      const shift = tr.getBoundingClientRect().top - boxTop + wrap.scrollTop - anchor.at;
      if (Math.abs(shift) >= 0.5) wrap.scrollTop += shift;
    }
  }
  const head = boxView(wrap, body).headHeight;
  const first = rows.find((r) => r.getBoundingClientRect().bottom > boxTop + head);
  if (first) { anchor.key = first.dataset.rowKey!; anchor.at = first.getBoundingClientRect().top - boxTop + wrap.scrollTop; }
}

/**
 * A table in its scrolled box (`.table-wrap`) that draws only the rows in or
 * near the box (issue 16): a long table laid out whole cost the page 150–800 ms
 * after each analysis stage. Spacer rows above and below stand for the rows not
 * drawn. Row heights are measured after layout (a ResizeObserver on the body and
 * the box, reading the drawn rows' tops then, never in render) and kept under
 * each row's key; rows not drawn yet take the mean. Scrolling re-renders this
 * component only, once per frame. Tables of at most DRAW_ALL_UP_TO rows draw
 * every row. The arithmetic is src/ui/windowed-rows.ts.
 */
export function WindowedTable({ label, className, testId, head, keys, columns, row, rowIndex = (i) => i + 2, rowCount, empty, reveal = null }: WindowedTableProps) {
  const wrapRef = useRef<HTMLDivElement>(null);
  const bodyRef = useRef<HTMLTableSectionElement>(null);
  const measured = useRef(new Map<string, number>());
  const [view, setView] = useState<BoxView>({ scrollTop: 0, boxHeight: FIRST_BOX_ESTIMATE, headHeight: 0 });
  const [, setMeasureCount] = useState(0);
  const windowed = keys.length > DRAW_ALL_UP_TO;
  const anchor = useRef<Anchor>({ key: '', at: 0, due: false });

  // After a commit this component asked for itself (a scroll, new measured heights), before paint: the rows in
  // view stay where they were (see keepAnchor). A commit for new rows from outside is left alone.
  useLayoutEffect(() => {
    const wrap = wrapRef.current, body = bodyRef.current;
    if (!anchor.current.due || !wrap || !body) return;
    anchor.current.due = false;
    keepAnchor(wrap, body, anchor.current, true);
  });

  useEffect(() => {
    const wrap = wrapRef.current, body = bodyRef.current;
    if (!windowed || !wrap || !body) return;
    const readView = () => boxView(wrap, body);
    const sameView = (a: BoxView, b: BoxView) => Math.abs(a.scrollTop - b.scrollTop) < 1 && Math.abs(a.boxHeight - b.boxHeight) < 1 && Math.abs(a.headHeight - b.headHeight) < 1;
    let frame = 0;
    const onScroll = () => {
      if (frame) return;
      frame = requestAnimationFrame(() => {
        frame = 0;
        keepAnchor(wrap, body, anchor.current, false);
        anchor.current.due = true;
        const v = readView();
        setView((old) => (sameView(old, v) ? old : v));
      });
    };
    // After layout, before paint: the drawn rows' heights (a row's detail row counts in it), the box and the header.
    const measure = () => {
      keepAnchor(wrap, body, anchor.current, false);
      const tops: number[] = [], rowKeys: string[] = [];
      let bottom = body.getBoundingClientRect().bottom;
      for (const tr of Array.from(body.rows)) {
        const k = tr.dataset.rowKey;
        if (k !== undefined) { tops.push(tr.getBoundingClientRect().top); rowKeys.push(k); } else if (tr.classList.contains('spacer') && tops.length > 0) { bottom = tr.getBoundingClientRect().top; break; }
      }
      let changed = false;
      heightsFromTops(tops, bottom).forEach((h, j) => {
        const old = measured.current.get(rowKeys[j]);
        if (old === undefined || Math.abs(old - h) > 0.5) { measured.current.set(rowKeys[j], h); changed = true; }
      });
      // Heights of rows long gone (earlier analyses) are dropped, oldest first, so the mean stays cheap.
      for (const k of measured.current.keys()) { if (measured.current.size <= MEASURED_KEPT) break; measured.current.delete(k); }
      const v = readView();
      // Drawn again at once, so the new spacer heights are laid out (and the anchor kept) in this same frame.
      anchor.current.due = true;
      flushSync(() => {
        if (changed) setMeasureCount((c) => c + 1);
        setView((old) => (sameView(old, v) ? old : v));
      });
    };
    wrap.addEventListener('scroll', onScroll, { passive: true });
    const ro = typeof ResizeObserver === 'function' ? new ResizeObserver(measure) : null;
    ro?.observe(wrap);
    ro?.observe(body);
    return () => {
      wrap.removeEventListener('scroll', onScroll);
      ro?.disconnect();
      if (frame) cancelAnimationFrame(frame);
    };
  }, [windowed]);

  // Bring the revealed row into the box when it changes (not on every scroll: the user may scroll away from it).
  // A drawn row is placed by its real position (a row clicked at the box's edge moves only as far as it must);
  // a row not drawn by the estimated heights, then it is drawn and measured.
  useEffect(() => {
    const wrap = wrapRef.current, body = bodyRef.current;
    if (!windowed || reveal === null || !wrap || !body) return;
    const box = boxView(wrap, body);
    const tr = Array.from(body.rows).find((r) => r.dataset.rowKey === keys[reveal]);
    if (tr) {
      const top = tr.getBoundingClientRect().top - wrap.getBoundingClientRect().top - wrap.clientTop;
      const height = tr.getBoundingClientRect().height;
      if (top < box.headHeight) wrap.scrollTop += top - box.headHeight;
      else if (top + height > box.boxHeight) wrap.scrollTop += top + height - box.boxHeight;
      return;
    }
    const to = scrollToShow(rowHeights(keys, measured.current, meanHeight(measured.current)), reveal, box);
    if (to !== null) wrap.scrollTop = to;
    // Only a change of the revealed row moves the box; new keys alone do not.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [reveal, windowed]);

  const w = windowed ? rowWindow(rowHeights(keys, measured.current, meanHeight(measured.current)), view) : wholeWindow(keys.length);
  const drawn: ReactNode[] = [];
  for (let i = w.start; i < w.end; i++) drawn.push(row(i, { 'aria-rowindex': rowIndex(i), 'data-row-key': keys[i] }));
  const spacer = (where: string, height: number) => (
    <tr key={where} className="spacer" aria-hidden="true"><td colSpan={columns} style={{ height }} /></tr>
  );
  return (
    <div className="table-wrap" tabIndex={0} role="region" aria-label={label} ref={wrapRef}>
      <table className={className} data-testid={testId} aria-rowcount={keys.length > 0 ? (rowCount ?? keys.length + 1) : undefined} data-windowed={windowed ? 'true' : undefined}>
        {head}
        <tbody ref={bodyRef}>
          {w.before > 0 && spacer('spacer-before', w.before)}
          {drawn}
          {w.after > 0 && spacer('spacer-after', w.after)}
          {keys.length === 0 && empty}
        </tbody>
      </table>
    </div>
  );
}
