"""Running a minimizer in a child process, so a crash, a hang or an exhausted memory becomes a clear error.

The compiled minimizer keeps global configuration and may end the whole process on some internal errors, so the
heuristic path calls it through :class:`Isolated` (several may run at once, one per starting cover). A child gets
an address-space limit (``RLIMIT_AS``) of what it inherits from the parent plus ``memory_mb`` megabytes, so a run
that grows without bound fails on its own instead of exhausting the machine. What the parent makes of the child's
end (exit statuses in docs/conventions.md):

=================================================  =====================================================
the child ...                                      raises
=================================================  =====================================================
does not answer within the time limit              :class:`~plaforge.core.errors.TimeLimit`, naming
                                                   ``--time-limit``
raises ``MemoryError``, or dies while its memory   :class:`~plaforge.core.errors.SizeLimit`: "exceeded N MB",
was within 1/8 of its limit (a compiled library    naming ``--memory-limit``
fails its allocation)
is killed by ``SIGKILL`` (the kernel's answer to   :class:`~plaforge.core.errors.SizeLimit`; the machine's
an exhausted machine)                              memory, which no option raises
dies otherwise, or raises anything else            :class:`~plaforge.core.errors.InternalError`
=================================================  =====================================================

The parent samples the child's address-space size (``/proc/PID/statm``, where there is one) while it waits.
"""

from __future__ import annotations

import multiprocessing
import os
import signal
import time
from collections.abc import Callable
from typing import Any

from ..core.errors import InternalError, SizeLimit, TimeLimit

__all__ = ["Isolated", "run_isolated"]

#: The signal the kernel's out-of-memory killer sends (absent on platforms without it).
_SIGKILL = getattr(signal, "SIGKILL", 0)
#: Seconds between two samples of a child's memory.
_SAMPLE = 0.05


def _address_space(pid: int | str = "self") -> int:
    """Bytes of address space of process ``pid`` (0 where /proc is missing)."""
    try:
        with open(f"/proc/{pid}/statm", encoding="ascii") as fh:
            return int(fh.read().split()[0]) * os.sysconf("SC_PAGE_SIZE")
    except (OSError, ValueError, IndexError):
        return 0


def _child(conn: Any, fn: Callable[..., Any], args: tuple, memory_mb: int | None,
           nice: int) -> None:  # pragma: no cover
    try:
        if nice:
            try:
                os.nice(nice)
            except (AttributeError, OSError):  # platforms without it: the same work at normal priority
                pass
        if memory_mb is not None:
            import resource

            base = _address_space()
            if base:
                hard = resource.getrlimit(resource.RLIMIT_AS)[1]
                soft = base + (memory_mb << 20)
                if hard != resource.RLIM_INFINITY:
                    soft = min(soft, hard)
                resource.setrlimit(resource.RLIMIT_AS, (soft, hard))
        conn.send(("ok", fn(*args)))
    except MemoryError as exc:
        conn.send(("memory", f"MemoryError: {exc}"))
    except BaseException as exc:  # noqa: BLE001 - everything is reported to the parent
        conn.send(("error", f"{type(exc).__name__}: {exc}"))
    finally:
        conn.close()


class Isolated:
    """``fn(*args)`` running in a child process (``fork`` where available, else ``spawn``; ``fn``, its arguments
    and its result must pickle).

    Parameters
    ----------
    fn, args : callable, tuple
        What to run.
    what : str
        Names the work in error messages (``"the heuristic minimizer"``).
    memory_mb : int or None
        Megabytes the child may grow beyond what it inherits; ``None``: no limit of its own.
    nice : int
        Added to the child's niceness (``os.nice``): a positive value lets it use only what other work leaves idle.
    """

    def __init__(self, fn: Callable[..., Any], args: tuple, what: str, memory_mb: int | None = None,
                 nice: int = 0) -> None:
        methods = multiprocessing.get_all_start_methods()
        ctx = multiprocessing.get_context("fork" if "fork" in methods else "spawn")
        self.what = what
        self.memory_mb = memory_mb
        self.started = time.monotonic()
        self._recv, send = ctx.Pipe(duplex=False)
        self._proc = ctx.Process(target=_child, args=(send, fn, args, memory_mb, nice), daemon=True)
        self._proc.start()
        send.close()
        self._base = _address_space(self._proc.pid or 0)
        self._peak = self._base

    def ready(self) -> bool:
        """Whether the answer (or the child's end) has come, without waiting or sampling memory."""
        return self._recv.closed or bool(self._recv.poll(0))

    def wait(self, timeout: float) -> bool:
        """Wait up to ``timeout`` seconds for the answer; whether it (or the child's end) has come."""
        end = time.monotonic() + max(0.0, timeout)
        while True:
            if self._recv.poll(min(_SAMPLE, max(0.0, end - time.monotonic()))):
                return True
            self._peak = max(self._peak, _address_space(self._proc.pid or 0))
            if time.monotonic() >= end:
                return False

    def result(self, timeout: float, limit_note: str = "") -> Any:
        """The answer, waiting up to ``timeout`` seconds; the child is ended either way.

        Raises :class:`TimeLimit` (``limit_note`` is added to its message), :class:`SizeLimit` or
        :class:`InternalError` as the module docs say.
        """
        try:
            if not self.wait(timeout):
                raise TimeLimit(f"{self.what} did not finish within {timeout:g} s{limit_note}", "--time-limit")
            try:
                status, payload = self._recv.recv()
            except EOFError:
                self._proc.join(5)
                raise self._died() from None
        finally:
            self.stop()
        if status == "memory":
            raise self._exceeded(payload)
        if status != "ok":
            raise InternalError(f"{self.what} failed: {payload}")
        return payload

    def stop(self) -> None:
        """End the child (if still running) and release its pipe."""
        if self._proc.is_alive():
            self._proc.kill()
        self._proc.join(5)
        self._recv.close()

    def _exceeded(self, detail: str) -> SizeLimit:
        if self.memory_mb is None:
            return SizeLimit(f"{self.what} ran out of memory on this input ({detail}); no option raises this limit: "
                             "it is the memory of the machine")
        return SizeLimit(f"{self.what} exceeded {self.memory_mb} MB of memory ({detail}); raise --memory-limit "
                         "if the machine has more", "--memory-limit")

    def _died(self) -> Exception:
        code = self._proc.exitcode
        if code == -_SIGKILL:
            return SizeLimit(f"{self.what} ran out of memory on this input (the system killed it with SIGKILL); no "
                             "option raises this limit: it is the memory of the machine")
        if self.memory_mb is not None and self._base and self._peak >= self._base + (self.memory_mb << 20) * 7 // 8:
            return self._exceeded(f"it ended with status {code} at {self._peak >> 20} MB of address space")
        return InternalError(f"{self.what} crashed (exit status {code}) on this input; the cover could not be "
                             "computed")


def run_isolated(fn: Callable[..., Any], args: tuple, timeout: float, what: str,
                 memory_mb: int | None = None) -> Any:
    """Call ``fn(*args)`` in a child process (:class:`Isolated`) and return its result within ``timeout`` seconds.

    Raises
    ------
    plaforge.core.errors.TimeLimit
        No answer within ``timeout`` seconds.
    plaforge.core.errors.SizeLimit
        The child ran out of memory.
    plaforge.core.errors.InternalError
        The child crashed or ``fn`` raised.
    """
    return Isolated(fn, args, what, memory_mb).result(timeout)
