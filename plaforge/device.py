"""Device profiles and the fit of a cover and a LUT network to one.

A profile is a small TOML file (docs/devices.md) with one ``[device]`` table; every figure is optional, and a
figure left out is not checked:

==================  =========================================================================================
key                 meaning
==================  =========================================================================================
``name``            what reports call the profile
``description``     one line for people
``inputs``          input pins the logic may use
``outputs``         outputs (macrocells)
``terms_per_output`` product terms one output's OR gate takes
``lend_terms``      ``true``: an output may borrow the spare terms of the macrocell on either side
``rows``            shared AND-plane rows (distinct product terms over all outputs)
``polarity``        ``true``: each output has a programmable inverter (phase assignment is free)
``lut_size``        inputs of one LUT (2 to 8)
``luts``            LUTs available
``max_depth``       most LUTs on a path from an input to an output
==================  =========================================================================================

Built-in profiles (:data:`BUILTIN`) are named by their figures. :func:`fit` compares figures and says, per output
and overall, whether the result fits, by how much it misses, and what would help.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass, fields
from pathlib import Path

from .core.cube import Cover
from .core.errors import PlaforgeError
from .core.network import LutNetwork
from .core.table import Table
from .lut.depth import cone_sizes

__all__ = ["BUILTIN", "PROFILE_KEYS", "Profile", "fit", "fit_lines", "load_profile", "lut_cones"]

BUILTIN: dict[str, str] = {
    "sop-8x8": """[device]
name = "sop-8x8"
description = "8 outputs of up to 8 product terms each, 16 inputs, programmable output polarity"
inputs = 16
outputs = 8
terms_per_output = 8
lend_terms = false
polarity = true
""",
    "sop-8x4-fixed": """[device]
name = "sop-8x4-fixed"
description = "8 outputs of up to 4 product terms each, 12 inputs, fixed active-high outputs"
inputs = 12
outputs = 8
terms_per_output = 4
lend_terms = false
polarity = false
""",
    "sop-10x16": """[device]
name = "sop-10x16"
description = "10 outputs of up to 16 product terms each, 22 inputs, neighbours lend spare terms, programmable polarity"
inputs = 22
outputs = 10
terms_per_output = 16
lend_terms = true
polarity = true
""",
    "pla-16x48x8": """[device]
name = "pla-16x48x8"
description = "16 inputs, 48 shared AND-plane rows, 8 outputs with programmable polarity"
inputs = 16
outputs = 8
rows = 48
polarity = true
""",
    "lut4x64": """[device]
name = "lut4x64"
description = "a region of 64 four-input LUTs, at most 4 levels"
lut_size = 4
luts = 64
max_depth = 4
""",
    "lut6x32": """[device]
name = "lut6x32"
description = "a region of 32 six-input LUTs, at most 3 levels"
lut_size = 6
luts = 32
max_depth = 3
""",
}
"""Built-in profiles by name: the text of each, in the same format a profile file uses."""


@dataclass(frozen=True)
class Profile:
    """A device's figures (``None``: not limited). See the module docs for each key."""

    name: str
    description: str = ""
    inputs: int | None = None
    outputs: int | None = None
    terms_per_output: int | None = None
    lend_terms: bool = False
    rows: int | None = None
    polarity: bool = False
    lut_size: int | None = None
    luts: int | None = None
    max_depth: int | None = None


PROFILE_KEYS = tuple(f.name for f in fields(Profile))


def _parse(text: str, where: str, default_name: str) -> Profile:
    try:
        doc = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise PlaforgeError(f"{where}: not a device profile ({exc})") from None
    dev = doc.get("device")
    if not isinstance(dev, dict) or set(doc) != {"device"}:
        raise PlaforgeError(f"{where}: a device profile is one [device] table")
    values: dict[str, object] = {"name": default_name}
    for key, value in dev.items():
        if key not in PROFILE_KEYS:
            raise PlaforgeError(f"{where}: unknown key {key!r} in [device]; expected {', '.join(PROFILE_KEYS)}")
        kind = {"name": str, "description": str, "lend_terms": bool, "polarity": bool}.get(key, int)
        if not isinstance(value, kind) or (kind is int and (isinstance(value, bool) or value < 0)):
            want = {str: "a string", bool: "true or false", int: "a whole number >= 0"}[kind]
            raise PlaforgeError(f"{where}: [device] {key} = {value!r}; expected {want}")
        values[key] = value
    if values.get("lut_size") is not None and not 2 <= values["lut_size"] <= 8:  # type: ignore[operator]
        raise PlaforgeError(f"{where}: [device] lut_size = {values['lut_size']}; expected 2 to 8")
    return Profile(**values)  # type: ignore[arg-type]


def load_profile(name_or_path: str) -> Profile:
    """A built-in profile by name, or a profile file (``.toml``) by path; exit status 2 when neither."""
    if name_or_path in BUILTIN:
        return _parse(BUILTIN[name_or_path], f"built-in profile {name_or_path}", name_or_path)
    p = Path(name_or_path)
    if p.is_file():
        try:
            text = p.read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError) as exc:
            raise PlaforgeError(f"{p}: cannot read the device profile: {exc}") from None
        return _parse(text, str(p), p.stem)
    raise PlaforgeError(f"--device {name_or_path!r}: no such profile file, and no built-in profile of that name; "
                        f"built-in: {', '.join(sorted(BUILTIN))}")


def lut_cones(net: LutNetwork) -> dict[str, int]:
    """Output name -> LUTs in its fan-in cone (LUTs shared between outputs count for each)."""
    return dict(zip(net.output_names, cone_sizes(net)))


def _limit(what: str, used: int, available: int | None) -> dict | None:
    if available is None:
        return None
    return {"what": what, "used": used, "available": available, "fits": used <= available,
            "over": max(0, used - available)}


def _lend(needs: list[int], per: int, macrocells: int | None, lend: bool) -> list[int]:
    """Terms each output gets: its own ``per``, plus (with ``lend``) spare terms of the neighbouring macrocells.

    Outputs sit in macrocells 0, 1, ... in output order; macrocells past the last output are spare. Each output
    in turn borrows from its left neighbour's spare terms, then from its right neighbour's.
    """
    cells = max(len(needs), macrocells or 0)
    spare = [per - n if j < len(needs) else per for j, n in enumerate(needs + [0] * (cells - len(needs)))]
    got = [min(n, per) for n in needs]
    if not lend:
        return got
    for j, n in enumerate(needs):
        for nb in (j - 1, j + 1):
            if got[j] < n and 0 <= nb < cells and spare[nb] > 0:
                take = min(spare[nb], n - got[j])
                spare[nb] -= take
                got[j] += take
    return got


def fit(profile: Profile, table: Table, cover: Cover, net: LutNetwork | None,
        complement_terms: dict[str, int] | None = None, larger_k: LutNetwork | None = None) -> dict:
    """Whether ``cover`` and ``net`` fit ``profile``, per output and overall, with what would help.

    Parameters
    ----------
    complement_terms : dict, optional
        Output name -> terms of a cover of that output's complement; used to say whether inverting an output
        that does not fit would make it fit.
    larger_k : LutNetwork, optional
        The same table mapped with a larger LUT size, quoted when the LUTs do not fit.

    Returns
    -------
    dict
        ``profile``, ``fits``, ``limits`` (list of ``{what, used, available, fits, over}``), ``outputs`` (output
        name -> ``{terms, available, fits, inverted, help}``) and ``help`` (list of strings).
    """
    terms = cover.terms()
    limits = [x for x in (
        _limit("inputs", table.n_inputs, profile.inputs),
        _limit("outputs", table.n_outputs, profile.outputs),
        _limit("rows", cover.rows, profile.rows),
        _limit("luts", net.count, profile.luts) if net is not None else None,
        _limit("depth", net.depth, profile.max_depth) if net is not None else None,
    ) if x is not None]
    per = profile.terms_per_output
    outputs: dict[str, dict] = {}
    names = list(cover.output_names)
    if per is not None:
        got = _lend([terms[n] for n in names], per, profile.outputs, profile.lend_terms)
        for j, n in enumerate(names):
            need = terms[n]
            helps = []
            if need > got[j]:
                comp = (complement_terms or {}).get(n)
                if comp is not None and not cover.is_inverted(j):
                    if profile.polarity:
                        helps.append(f"inverting it needs {comp} terms")
                    else:
                        helps.append(f"its complement needs {comp} terms (this device has fixed polarity: an "
                                     "inverter outside would be needed)")
                if need <= 2 * per - 1:
                    helps.append(f"splitting it over two macrocells gives {2 * per - 1} terms "
                                 "(one spare output, its sum fed back as one term)")
                if not profile.lend_terms:
                    helps.append("a device whose neighbouring macrocells lend spare terms")
            outputs[n] = {"terms": need, "available": got[j] if need > got[j] else per, "fits": need <= got[j],
                          "inverted": cover.is_inverted(j), "help": helps}
    overall = []
    for lim in limits:
        if lim["fits"]:
            continue
        if lim["what"] == "luts" and larger_k is not None:
            overall.append(f"with {larger_k.k}-input LUTs the network takes {larger_k.count} LUTs, depth "
                           f"{larger_k.depth}")
        if lim["what"] == "rows" and not cover.inverted and profile.polarity:
            overall.append("phase assignment (inverted outputs) may save rows: build --phase")
    ok = all(lim["fits"] for lim in limits) and all(o["fits"] for o in outputs.values())
    return {"profile": profile.name, "fits": ok, "limits": limits, "outputs": outputs, "help": overall}


def fit_lines(result: dict) -> list[str]:
    """The fit in plain words, one line per limit and per output (for the text and Markdown reports)."""
    head = "fits" if result["fits"] else "does not fit"
    lines = [f"device {result['profile']}: {head}"]
    for lim in result["limits"]:
        how = (f"{lim['available'] - lim['used']} spare" if lim["fits"] else f"{lim['over']} over")
        lines.append(f"  {lim['what']}: needs {lim['used']}, {lim['available']} available: {how}")
    for name, o in result["outputs"].items():
        inv = " (inverted)" if o["inverted"] else ""
        if o["fits"]:
            lines.append(f"  {name}{inv}: {o['terms']} of {o['available']} terms")
        else:
            lines.append(f"  {name}{inv}: needs {o['terms']} terms, {o['available']} available: "
                         f"{o['terms'] - o['available']} over")
            lines += [f"    would help: {h}" for h in o["help"]]
    lines += [f"  would help: {h}" for h in result["help"]]
    return lines
