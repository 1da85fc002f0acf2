"""Do ``--time-limit`` and ``--memory-limit`` hold? The exact path on the 7x7-bit multiplier table (14 in, 14 out).

Run from the repository root::

    python -m benchmarks.bench_limits [--limits 5 15 60] [--memory-limit 2048]

Each limit runs ``plaforge minimize SPEC --exact --time-limit L --json`` in a child process (the spec is the
multiplier written as a PLA file first) and prints, beside the limit: the child's wall time, its peak resident memory
(``ru_maxrss`` from ``os.wait4``), its exit status, and the figures of the JSON object (rows, optimal, lower bound,
what stopped early) or the one-line error. The wall time includes Python's start-up and reading the spec; the limit
covers the minimize call. Start-up is measured as the wall time of a child that imports the command line and reads
the spec, nothing else (``plaforge inspect`` once served, but it now computes figures of its own). Exit status 1 when
a run exceeds its limit by more than 10 % plus that start-up. ``--spec-type fr`` writes every point as a row (ON and
OFF given, the don't-care set computed from them) instead of the ON rows only.
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from benchmarks.suite import machine, multiplier


def _spec(directory: Path, kind: str = "f") -> Path:
    """The multiplier as a ``.type f`` PLA (one row per product with some 1 bit; the other points are OFF), or as
    ``.type fr`` with every point a row."""
    table = multiplier(7, 7)
    n, m = table.n_inputs, table.n_outputs
    path = directory / "mul7x7.pla"
    lines = [f".i {n}", f".o {m}", ".ilb " + " ".join(table.input_names), ".ob " + " ".join(table.output_names),
             f".type {kind}"]
    for p in range(1 << n):
        prod = (p & 127) * (p >> 7)
        if prod or kind == "fr":
            lines.append("".join(str(p >> i & 1) for i in range(n)) + " " + "".join(str(prod >> j & 1) for j in range(m)))
    path.write_text("\n".join(lines + [".e", ""]))
    return path


#: What a child does before minimizing: import the command line and read the spec.
_STARTUP = "import sys; import plaforge.cli; from plaforge.formats import read_spec; read_spec(sys.argv[1])"


def run(spec: Path, limit: float, memory: int) -> tuple[float, float, int, str]:
    """Wall seconds, peak MB (the child's own ``ru_maxrss``), exit status and a short verdict of one child run."""
    cmd = [sys.executable, "-m", "plaforge", "minimize", str(spec), "--exact", "--time-limit", str(limit),
           "--memory-limit", str(memory), "--json"]
    with tempfile.TemporaryFile("w+") as out, tempfile.TemporaryFile("w+") as err:
        t0 = time.monotonic()
        proc = subprocess.Popen(cmd, stdout=out, stderr=err, text=True)
        _, status, usage = os.wait4(proc.pid, 0)
        wall = time.monotonic() - t0
        proc.returncode = os.waitstatus_to_exitcode(status)
        out.seek(0)
        err.seek(0)
        text, message = out.read(), err.read().strip()
    code = proc.returncode
    if code == 0:
        d = json.loads(text)
        verdict = (f"rows {d['rows']}, optimal {d['optimal']}, lower bound {d['lower_bound']}, "
                   f"stopped early {d['stopped_early'] or 'no'}")
    else:
        verdict = message.splitlines()[-1] if message else "(no message)"
    return wall, usage.ru_maxrss / 1024, code, verdict


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--limits", type=float, nargs="*", default=[5.0, 15.0, 60.0])
    parser.add_argument("--memory-limit", type=int, default=2048)
    parser.add_argument("--spec-type", choices=["f", "fr"], default="f")
    args = parser.parse_args()
    print(machine())
    print(f"mul7x7 (14 in, 14 out) as .type {args.spec_type}, --exact, --memory-limit {args.memory_limit} MB")
    print(f"{'limit s':>8} {'wall s':>8} {'peak MB':>8} {'exit':>4}  result")
    bad = 0
    with tempfile.TemporaryDirectory() as tmp:
        spec = _spec(Path(tmp), args.spec_type)
        t0 = time.monotonic()
        subprocess.run([sys.executable, "-c", _STARTUP, str(spec)], capture_output=True, check=True)
        startup = time.monotonic() - t0
        print(f"start-up (import the command line, read the spec): {startup:.1f} s")
        for limit in args.limits:
            wall, peak, code, verdict = run(spec, limit, args.memory_limit)
            over = wall > limit * 1.1 + startup
            bad += over
            print(f"{limit:8.1f} {wall:8.1f} {peak:8.0f} {code:4d}  {verdict}{'  OVER THE LIMIT' if over else ''}",
                  flush=True)
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
