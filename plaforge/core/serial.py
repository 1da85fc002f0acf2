"""Covers and LUT networks as JSON objects, and as the lines a generated module carries.

A LUT network's object is the LUT JSON contract (:meth:`plaforge.core.network.LutNetwork.to_json_obj`). A cover's
object is :func:`cover_to_json_obj`: ``inputs`` and ``outputs`` (names in order), ``inverted`` (names of the outputs
realized in complement) and ``rows``, one string per cube in PLA notation (input part, a space, output part).

A generated module carries its cover or network as lines (``PLAFORGE_ARTIFACT``, see docs/modules.md): a JSON
header, which is the object without its list of items plus ``"kind": "cover"`` or ``"kind": "luts"``, then one JSON
value per item (a row string, or a LUT object). :func:`artifact_lines` writes them, :func:`artifact_from_lines`
reads them back.
"""

from __future__ import annotations

import json
from collections.abc import Sequence
from typing import Any

from .cube import Cover, Cube
from .errors import ArtifactError
from .network import LutNetwork

__all__ = ["artifact_from_lines", "artifact_lines", "cover_from_json_obj", "cover_to_json_obj"]


def cover_to_json_obj(cover: Cover) -> dict[str, Any]:
    """The cover's logic as a JSON object (see the module docs); how it was obtained is not kept."""
    n, m = cover.n_inputs, cover.n_outputs
    return {
        "inputs": list(cover.input_names),
        "outputs": list(cover.output_names),
        "inverted": [cover.output_names[j] for j in range(m) if cover.is_inverted(j)],
        "rows": [c.text(n) + " " + "".join("1" if c.outputs >> j & 1 else "0" for j in range(m)) for c in cover.cubes],
    }


def cover_from_json_obj(obj: dict[str, Any]) -> Cover:
    """Inverse of :func:`cover_to_json_obj`.

    Raises
    ------
    KeyError, ValueError, TypeError
        On a malformed object (a missing key, a row that does not fit the names, an unknown inverted output).
    """
    ins, outs = tuple(obj["inputs"]), tuple(obj["outputs"])
    inverted = 0
    for name in obj["inverted"]:
        inverted |= 1 << outs.index(name)
    cubes = []
    for row in obj["rows"]:
        ipart, opart = row.split(" ")
        if len(ipart) != len(ins) or len(opart) != len(outs) or set(opart) - {"0", "1"}:
            raise ValueError(f"row {row!r} does not fit {len(ins)} inputs and {len(outs)} outputs")
        cubes.append(Cube.parse(ipart, sum(1 << j for j, ch in enumerate(opart) if ch == "1")))
    return Cover(ins, outs, tuple(cubes), inverted=inverted)


# kind -> (the key of the item list, from the JSON object)
_KINDS = {"cover": "rows", "luts": "luts"}


def artifact_lines(artifact: Cover | LutNetwork) -> tuple[str, ...]:
    """The header line and one line per item (see the module docs)."""
    if isinstance(artifact, Cover):
        kind, obj = "cover", cover_to_json_obj(artifact)
    elif isinstance(artifact, LutNetwork):
        kind, obj = "luts", artifact.to_json_obj()
    else:
        raise TypeError(f"artifact must be a Cover or a LutNetwork, not {type(artifact).__name__}")
    items = obj.pop(_KINDS[kind])
    return (json.dumps({"kind": kind, **obj}), *(json.dumps(item) for item in items))


def artifact_from_lines(lines: Sequence[str]) -> Cover | LutNetwork:
    """The Cover or LutNetwork that :func:`artifact_lines` wrote.

    Raises
    ------
    ArtifactError
        If the lines are malformed (a hand-edited file, say).
    """
    try:
        obj = json.loads(lines[0])
        kind = obj.pop("kind")
        if kind not in _KINDS:
            raise ValueError(f"unknown kind {kind!r}; expected 'cover' or 'luts'")
        obj[_KINDS[kind]] = [json.loads(line) for line in lines[1:]]
        return cover_from_json_obj(obj) if kind == "cover" else LutNetwork.from_json_obj(obj)
    except (ValueError, KeyError, TypeError, IndexError, AttributeError) as exc:
        raise ArtifactError(f"PLAFORGE_ARTIFACT data is malformed ({exc}); regenerate the module") from None
