"""``plaforge demo``: every bundled sample through every stage, one subfolder and one report per sample."""

from __future__ import annotations

import time
from pathlib import Path

import click

from ..bundled import sample_names, sample_path
from ..core.errors import CheckFailed, LimitReached
from ..flow import BuildOptions, BuildResult, build
from ..formats import read_spec
from ..minimize.summary import cover_summary
from ..report import CAUTION, build_report
from .group import cli

DEMO_TIME_LIMIT = 10.0  # seconds the exact path may spend on one sample before keeping its best cover


def _subfolders(names: list[str]) -> dict[str, str]:
    """Sample file name -> subfolder name: the stem, or the whole name with '.' as '_' when stems collide."""
    stems = [Path(n).stem for n in names]
    return {n: s if stems.count(s) == 1 else n.replace(".", "_") for n, s in zip(names, stems)}


def _build_one(name: str, out: Path) -> tuple[BuildResult, str]:
    """Build one sample: the exact path within the demo's time limit, the heuristic where the exact one refuses."""
    path = sample_path(name)
    table = read_spec(path)
    try:
        return build(table, out, BuildOptions(exact=True, time_limit=DEMO_TIME_LIMIT), spec_path=path), ""
    except LimitReached:
        return build(table, out, BuildOptions(), spec_path=path), "heuristic, too large for the exact path"


def _line(name: str, r: BuildResult, how: str, seconds: float) -> str:
    cov = cover_summary(r.cover)
    if not how:
        how = "proven minimum" if cov["optimal"] else \
            f"best in {DEMO_TIME_LIMIT:g} s, lower bound {cov['lower_bound']}"
    net = r.network
    luts = f", {net.count} {net.k}-input LUTs in depth {net.depth}" if net is not None else ""
    verdict = "pass" if r.passed else "FAIL"
    return (f"  {name}: {r.table.n_inputs} inputs, {r.table.n_outputs} outputs; {cov['rows']} product terms "
            f"({how}){luts}; {len(r.verdicts)} checks {verdict}; {seconds:.1f} s")


@cli.command("demo")
@click.option("-o", "--output", "out", type=click.Path(), default="plaforge-demo", show_default=True,
              help="Directory for the artifacts (one subfolder per sample).")
def demo_cmd(out: str) -> None:
    """Build every bundled sample: minimize, map to LUTs, write the Amaranth modules and Verilog, check each
    artifact against its table, and write a report per sample; print one line per sample and where the reports
    are."""
    names = sample_names()
    folders = _subfolders(names)
    click.echo(f"building the {len(names)} bundled samples into {out}/ (one subfolder each)")
    failed: list[tuple[str, BuildResult]] = []
    reports: list[Path] = []
    results: list[tuple[str, BuildResult]] = []
    start = time.monotonic()
    for name in names:
        t0 = time.monotonic()
        result, how = _build_one(name, Path(out) / folders[name])
        click.echo(_line(name, result, how, time.monotonic() - t0))
        results.append((name, result))
        if not result.passed:
            failed.append((name, result))
        reports.append(result.artifacts.get("report_html", Path(out) / folders[name]))
    click.echo(f"{len(names)} samples in {time.monotonic() - start:.1f} s; each checked against its table: "
               f"{', '.join(dict.fromkeys(k for _n, r in results for k in r.verdicts))}")
    click.echo("reports (open the .html in a browser; report.md beside it is the same in plain text):")
    for p in reports:
        click.echo(f"  {p}")
    for name, result in failed:
        click.echo(f"\n{name}:\n{build_report(result)}")
    click.echo(CAUTION)
    if failed:
        raise CheckFailed(f"an artifact of {', '.join(n for n, _ in failed)} does not match its table (see above)")
