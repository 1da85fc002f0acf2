"""Many specs at once: ``build``, ``minimize`` and ``luts`` over every bundled sample, pool against one at a time.

Run from the repository root::

    python -m benchmarks.bench_batch [--repeat N]

For each command, three ways of doing the same work on the bundled samples (``samples/``: every ``.pla``, ``.csv``
and ``.toml``), each a fresh ``python -m plaforge`` process timed by wall clock (``time.perf_counter``, best of
``--repeat``, default 1):

* ``separate``: one process per spec, one after another (what a script did before several specs were accepted);
* ``-j 1``: one process, the specs one after another in it;
* ``-j 2``: one process, the specs in two worker processes.

The ratio column is each time over the ``separate`` time. Every run writes into its own folder; the files of the
``-j 1`` and ``-j 2`` runs must be byte-identical (the pool may not change results), and every run must exit 0;
either failing is printed and makes the script exit 1. The machine is named above the table, with the load
average before and after: on a shared machine the figures move with the load.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))  # run from a checkout without installing

from benchmarks.suite import machine, print_header, verdict
from plaforge.batch import expand_specs

SAMPLES = ROOT / "samples"
COMMANDS = {  # command -> (arguments after the specs, the output option's value for one spec or several)
    "build": ([], lambda out, spec: str(out / Path(spec).stem) if spec else str(out)),
    "minimize": ([], lambda out, spec: str(out / (Path(spec).stem + ".pla")) if spec else str(out)),
    "luts": (["-k", "4"], lambda out, spec: str(out / (Path(spec).stem + ".luts.json")) if spec else str(out)),
}


def _run(args: list[str]) -> tuple[float, int]:
    env = dict(os.environ, PYTHONPATH=str(ROOT) + os.pathsep + os.environ.get("PYTHONPATH", ""))
    t0 = time.perf_counter()
    proc = subprocess.run([sys.executable, "-m", "plaforge", *args], env=env, capture_output=True, text=True,
                          check=False)
    return time.perf_counter() - t0, proc.returncode


def _files(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=1, help="runs of each way; the best time is printed")
    args = parser.parse_args()
    specs = expand_specs([str(SAMPLES)])
    print(f"machine: {machine()}")
    print(f"load average before: {' '.join(f'{x:.2f}' for x in os.getloadavg())}")
    print(f"specs: {len(specs)} bundled samples ({', '.join(Path(s).name for s in specs)})")
    print()
    print_header(f"{'command':<9} {'way':<9} {'seconds':>8} {'ratio':>6}")
    problems: list[str] = []
    with tempfile.TemporaryDirectory() as tmp:
        for cmd, (extra, out_for) in COMMANDS.items():
            base = None
            for way in ("separate", "-j 1", "-j 2"):
                best = float("inf")
                for r in range(args.repeat):
                    out = Path(tmp) / cmd / f"{way.replace(' ', '').lstrip('-')}-{r}"
                    if way == "separate":
                        out.mkdir(parents=True)
                        seconds, code = 0.0, 0
                        for spec in specs:
                            s, c = _run([cmd, spec, "-o", out_for(out, spec), *extra])
                            seconds, code = seconds + s, max(code, c)
                    else:
                        seconds, code = _run([cmd, *specs, "-o", out_for(out, None), "-j", way[-1], *extra])
                    if code != 0:
                        problems.append(f"{cmd} {way}: exit status {code}")
                    best = min(best, seconds)
                base = best if base is None else base
                print(f"{cmd:<9} {way:<9} {best:>8.2f} {best / base:>6.2f}")
            if _files(Path(tmp) / cmd / "j1-0") != _files(Path(tmp) / cmd / "j2-0"):
                problems.append(f"{cmd}: -j 1 and -j 2 wrote different files")
    print()
    print(f"load average after: {' '.join(f'{x:.2f}' for x in os.getloadavg())}")
    return verdict(problems, "checks", "FAILED")


if __name__ == "__main__":
    raise SystemExit(main())
