"""Printing the outcomes of several specs (``build``, ``minimize``, ``luts`` over a list or a directory)."""

from __future__ import annotations

import json
from collections.abc import Callable, Sequence

import click

from ..batch import SpecOutcome, worst_error

__all__ = ["echo_outcomes"]


def echo_outcomes(outcomes: Sequence[SpecOutcome], as_json: bool, summary: Callable[[int, int], str],
                  sort_keys: bool = False) -> None:
    """One JSON list, or one line per spec and ``summary(succeeded, failed)``; then raise the worst error (the
    command's exit status), if any spec failed."""
    if as_json:
        click.echo(json.dumps([o.to_json_obj() for o in outcomes], sort_keys=sort_keys))
    else:
        for o in outcomes:
            click.echo(o.line)
        ok = sum(o.status == 0 for o in outcomes)
        click.echo(summary(ok, len(outcomes) - ok))
    error = worst_error(outcomes)
    if error is not None:
        raise error
