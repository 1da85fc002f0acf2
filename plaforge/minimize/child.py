"""Running a minimizer in a child process, so a crash, a hang or an exhausted memory becomes a clear error.

The compiled minimizer keeps global configuration and may end the whole process on some internal errors, so the
heuristic path calls it through :func:`run_isolated`. What the parent makes of the child's end (exit statuses in
docs/conventions.md):

=================================================  =====================================================
the child ...                                      raises
=================================================  =====================================================
does not answer within the time limit              :class:`~plaforge.core.errors.TimeLimit`, naming
                                                   ``--time-limit``
raises ``MemoryError`` or is killed by ``SIGKILL``  :class:`~plaforge.core.errors.SizeLimit`; no option raises
(the kernel's answer to an exhausted memory)       that limit, and the message says so
dies otherwise, or raises anything else            :class:`~plaforge.core.errors.InternalError`
=================================================  =====================================================
"""

from __future__ import annotations

import multiprocessing
import signal
from collections.abc import Callable
from typing import Any

from ..core.errors import InternalError, SizeLimit, TimeLimit

__all__ = ["run_isolated"]

#: The signal the kernel's out-of-memory killer sends (absent on platforms without it).
_SIGKILL = getattr(signal, "SIGKILL", 0)


def _child(conn: Any, fn: Callable[..., Any], args: tuple) -> None:  # pragma: no cover - runs in the child
    try:
        conn.send(("ok", fn(*args)))
    except MemoryError as exc:
        conn.send(("memory", f"MemoryError: {exc}"))
    except BaseException as exc:  # noqa: BLE001 - everything is reported to the parent
        conn.send(("error", f"{type(exc).__name__}: {exc}"))
    finally:
        conn.close()


def _out_of_memory(what: str, detail: str) -> SizeLimit:
    return SizeLimit(
        f"{what} ran out of memory on this input ({detail}); no option raises this limit: it is the memory of the "
        "machine"
    )


def run_isolated(fn: Callable[..., Any], args: tuple, timeout: float, what: str) -> Any:
    """Call ``fn(*args)`` in a child process and return its result.

    Uses ``fork`` where available (a few milliseconds), ``spawn`` elsewhere. ``fn`` and its result must pickle.

    Parameters
    ----------
    fn : callable
        What to run in the child.
    args : tuple
        Its arguments.
    timeout : float
        Seconds to wait for the answer.
    what : str
        Names the work in error messages (``"the heuristic minimizer"``).

    Raises
    ------
    plaforge.core.errors.TimeLimit
        No answer within ``timeout`` seconds.
    plaforge.core.errors.SizeLimit
        The child ran out of memory.
    plaforge.core.errors.InternalError
        The child crashed or ``fn`` raised.
    """
    methods = multiprocessing.get_all_start_methods()
    ctx = multiprocessing.get_context("fork" if "fork" in methods else "spawn")
    recv, send = ctx.Pipe(duplex=False)
    proc = ctx.Process(target=_child, args=(send, fn, args), daemon=True)
    proc.start()
    send.close()
    try:
        if not recv.poll(timeout):
            raise TimeLimit(f"{what} did not finish within {timeout:g} s", "--time-limit")
        try:
            status, payload = recv.recv()
        except EOFError:
            proc.join(5)
            if proc.exitcode == -_SIGKILL:
                raise _out_of_memory(what, "the system killed it with SIGKILL") from None
            raise InternalError(
                f"{what} crashed (exit status {proc.exitcode}) on this input; the cover could not be computed"
            ) from None
    finally:
        if proc.is_alive():
            proc.kill()
        proc.join(5)
        recv.close()
    if status == "memory":
        raise _out_of_memory(what, payload)
    if status != "ok":
        raise InternalError(f"{what} failed: {payload}")
    return payload
