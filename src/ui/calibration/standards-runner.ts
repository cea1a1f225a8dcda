/**
 * Issue 21: keeps the standards' peaks current. Whenever the standard
 * traces, the method (steps, noise and peak settings) or the blank and
 * scans change, each standard trace is analysed in the computation worker
 * with the sample's method (no hand decisions, no alternatives) and its
 * peaks go into the store. A newer change drops the older run's results.
 */
import type { AnalyseRequest } from '../../core/analysis/index.ts';
import type { AppState } from '../../state/store.ts';
import { useApp } from '../../state/store.ts';
import type { StandardPeaks } from '../../state/calibration-slice.ts';
import { analyseTrace } from '../../state/service.ts';

let run = 0;
let timer: ReturnType<typeof setTimeout> | null = null;

function standardIds(s: AppState): string[] {
  return s.traces.filter((t) => s.roles[t.id] === 'standard').map((t) => t.id);
}

function requestFor(s: AppState, id: string): AnalyseRequest {
  const blank = s.traces.find((t) => s.roles[t.id] === 'blank');
  return {
    sampleId: id, blankId: blank?.id, scanIds: s.traces.filter((t) => s.roles[t.id] === 'scan').map((t) => t.id),
    recipe: s.recipe, noise: s.noiseSettings, peaks: s.peakSettings, decisions: { added: [], removed: [] }, alternatives: [],
  };
}

async function measureStandards(): Promise<void> {
  const mine = ++run;
  const s = useApp.getState();
  const ids = standardIds(s);
  if (ids.length === 0) { s.setStandardPeaks({}); s.setStandardsBusy(false); return; }
  s.setStandardsBusy(true);
  const out: Record<string, StandardPeaks> = {};
  for (const id of ids) {
    try {
      const r = await analyseTrace(requestFor(useApp.getState(), id));
      out[id] = r.peakProblem ? { ok: false, problem: r.peakProblem } : { ok: true, peaks: r.peaks };
    } catch (e) {
      out[id] = { ok: false, problem: e instanceof Error ? e.message : String(e) };
    }
    if (mine !== run) return;
  }
  useApp.getState().setStandardPeaks(out);
  useApp.getState().setStandardsBusy(false);
}

/** Ask for the standards to be measured again, shortly (several changes make one run). */
function schedule(): void {
  if (timer) clearTimeout(timer);
  timer = setTimeout(() => { timer = null; void measureStandards(); }, 250);
}

/** Start watching the store. Call once at start-up. */
export function startStandardsRunner(): () => void {
  return useApp.subscribe((s, prev) => {
    const changed = s.traces !== prev.traces || s.roles !== prev.roles || s.recipe !== prev.recipe
      || s.noiseSettings !== prev.noiseSettings || s.peakSettings !== prev.peakSettings;
    if (!changed) return;
    if (standardIds(s).length === 0 && standardIds(prev).length === 0) return;
    schedule();
  });
}
