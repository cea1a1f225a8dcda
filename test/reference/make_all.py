#!/usr/bin/env python3
"""Regenerate every committed reference in test/reference/ in one command
(`npm run reference`), then say which JSON files changed and by how much.

Runs each make_*.py here, and noise_bumps.py (an independent simulation of
the peak rules; a few minutes), with this Python, from the repository root.
Each script invents its inputs from a seeded NumPy generator and records the
SciPy and NumPy versions it ran with.

Same versions do not promise the same bytes: NumPy picks its vectorised
exp/sin/log code by what the processor offers, and those paths may differ in
the last bit. Rerun on 2026-12-02 with SciPy 1.17.1 / NumPy 2.4.6 on a
processor without AVX-512 (NumPy reports X86_V3), kernels, calibration, fit,
peak-shapes, real-noise, real-snr and noise-bumps came back byte-identical;
baseline, smoothing and peaks differed in the last bits (largest relative
difference 1.6e-13; the seeded inputs themselves moved by one ulp in a few
points, which in peaks.json moved one peak across the distance rule's tie in
trace 1). The tests read inputs and outputs from the same file, so either
version checks the TypeScript equally; do not commit such a rewrite without
a reason.

    python3 test/reference/make_all.py            # regenerate all
    python3 test/reference/make_all.py --quick    # all but noise_bumps.py
    python3 test/reference/make_all.py fit peaks  # only make_fit.py, make_peaks.py
    python3 test/reference/make_all.py --check    # regenerate, compare with the
                                                  # committed files, put them back
"""
import hashlib
import json
import pathlib
import subprocess
import sys
import time

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent.parent
SLOW = {"noise_bumps"}


def compare(old, new, path="", out=None):
    """Differences between two JSON values: (path, relative difference) for numbers, (path, what) otherwise."""
    out = [] if out is None else out
    if isinstance(old, dict) and isinstance(new, dict):
        for k in sorted(set(old) | set(new)):
            if k not in old or k not in new:
                out.append((f"{path}.{k}", "present in one file only"))
            else:
                compare(old[k], new[k], f"{path}.{k}", out)
    elif isinstance(old, list) and isinstance(new, list):
        if len(old) != len(new):
            out.append((path, f"{len(old)} values committed, {len(new)} now"))
        else:
            for i, (a, b) in enumerate(zip(old, new)):
                compare(a, b, f"{path}[{i}]", out)
    elif isinstance(old, (int, float)) and isinstance(new, (int, float)) and not isinstance(old, bool):
        if old != new:
            out.append((path, abs(old - new) / max(abs(old), abs(new))))
    elif old != new:
        out.append((path, f"{old!r} committed, {new!r} now"))
    return out


def main(argv):
    quick = "--quick" in argv
    check = "--check" in argv
    wanted = [a for a in argv if not a.startswith("--")]
    scripts = [s for s in sorted(HERE.glob("make_*.py")) if s.name != "make_all.py"] + [HERE / "noise_bumps.py"]
    names = {s.stem.removeprefix("make_"): s for s in scripts}
    if wanted:
        unknown = [w for w in wanted if w not in names]
        if unknown:
            sys.exit(f"no such reference script: {', '.join(unknown)} (have: {', '.join(names)})")
        scripts = [names[w] for w in wanted]
    elif quick:
        scripts = [s for s in scripts if s.stem not in SLOW]
    before = {p: p.read_bytes() for p in sorted(HERE.glob("*.json"))}
    try:
        for script in scripts:
            t0 = time.monotonic()
            print(f"== {script.relative_to(ROOT)}", flush=True)
            done = subprocess.run([sys.executable, str(script)], cwd=ROOT, stdout=subprocess.DEVNULL)
            if done.returncode != 0:
                sys.exit(f"{script.name} failed (exit {done.returncode})")
            print(f"   done in {time.monotonic() - t0:.1f} s", flush=True)
        after = {p: p.read_bytes() for p in sorted(HERE.glob("*.json"))}
    finally:
        if check:
            for p, b in before.items():
                p.write_bytes(b)
    same = [p.name for p in after if before.get(p) == after[p]]
    print(f"unchanged byte for byte: {', '.join(same) or 'none'}")
    for p in after:
        if before.get(p) == after[p]:
            continue
        if p not in before:
            print(f"{p.name}: new file")
            continue
        diffs = compare(json.loads(before[p]), json.loads(after[p]))
        rel = [d for _, d in diffs if isinstance(d, float)]
        other = [(w, d) for w, d in diffs if not isinstance(d, float)]
        print(
            f"{p.name}: {len(rel)} numbers differ"
            + (f", largest relative difference {max(rel):.2g}" if rel else "")
            + (f"; {len(other)} other differences, first: {other[0][0]}: {other[0][1]}" if other else "")
            + (" (formatting only)" if not diffs else "")
        )
    if check:
        print("committed files restored (--check)")


if __name__ == "__main__":
    main(sys.argv[1:])
