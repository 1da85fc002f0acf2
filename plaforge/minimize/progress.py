"""Progress display for long exact runs: a live line on stderr (rich), or nothing at all.

The display is off unless asked for (``MinimizeOptions.progress``); the CLI asks when stderr is a terminal. Updates
may come from solver threads; rich's live display redraws from its own thread, so updates only set fields.
"""

from __future__ import annotations

import time
from types import TracebackType
from typing import Any, Self

__all__ = ["Progress"]


class Progress:
    """Stage text plus named figures (primes generated, best rows, rows bound, ...) shown live on stderr.

    Use as a context manager; when ``enabled`` is false every method does nothing.
    """

    def __init__(self, enabled: bool, title: str) -> None:
        self.enabled = enabled
        self.title = title
        self.text = ""
        self.fields: dict[str, int] = {}
        self._live: Any = None
        self._t0 = time.monotonic()

    def __enter__(self) -> Self:
        if self.enabled:
            from rich.console import Console
            from rich.live import Live

            self._live = Live(self._render(), console=Console(stderr=True), refresh_per_second=4, transient=False,
                              get_renderable=self._render)
            self._live.__enter__()
        return self

    def __exit__(self, exc_type: type[BaseException] | None, exc: BaseException | None,
                 tb: TracebackType | None) -> None:
        if self._live is not None:
            self._live.__exit__(exc_type, exc, tb)
            self._live = None

    def _render(self) -> Any:
        from rich.text import Text

        figures = "  ".join(f"{k}: {v}" for k, v in self.fields.items())
        return Text(f"{self.title} [{time.monotonic() - self._t0:6.1f} s] {self.text}\n  {figures}")

    def stage(self, text: str) -> None:
        """Say what is being done now."""
        if self.enabled:
            self.text = text

    def update(self, **fields: int) -> None:
        """Set figures (e.g. ``primes=1680``); later values replace earlier ones."""
        if self.enabled:
            self.fields.update(fields)
