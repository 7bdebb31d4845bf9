"""Wording shared by the figures, the review page, the tables and the console (private).

Sources and how each was checked belong in the README and the docstrings,
not in what a user reads on a figure or page: :func:`user_text` takes the
bookkeeping words "from memory" out of reasons that quote the threshold
table.  :func:`velocity_text` says in plain words which velocity model a
result was converted with, and :func:`default_velocity_used` whether it was
the package default (no velocity given).
"""

from __future__ import annotations

import re

__all__ = ["user_text", "velocity_text", "velocity_label", "default_velocity_used", "DEFAULT_VELOCITY_FLAG"]

#: the short flag shown wherever a line was converted with the package default velocity
DEFAULT_VELOCITY_FLAG = "default velocity (none given): depths approximate"

_MEMORY = (
    (re.compile(r"\s*\((?:concept )?from memory\)", re.IGNORECASE), ""),
    (re.compile(r"\s*[,;]\s*from memory\b", re.IGNORECASE), ""),
    (re.compile(r"\bfrom memory\b\s*[,;]?\s*", re.IGNORECASE), ""),
    (re.compile(r"\(\s*\)"), ""),
    (re.compile(r"[ \t]{2,}"), " "),
)


def user_text(text) -> str:
    """``text`` without the bookkeeping words "from memory" (for figures, pages and the console).

    Examples
    --------
    >>> user_text("relief 340 m is above the bound 20 m (Widess 1973 lambda/4, from memory)")
    'relief 340 m is above the bound 20 m (Widess 1973 lambda/4)'
    >>> user_text("[steep_min_slope_deg; Kenter 1990 (from memory)]")
    '[steep_min_slope_deg; Kenter 1990]'
    """
    out = "" if text is None else str(text)
    for pattern, repl in _MEMORY:
        out = pattern.sub(repl, out)
    return out.strip()


def _num(v) -> str:
    return f"{float(v):g}"


def velocity_text(vel) -> str:
    """The velocity model of a result (its ``velocity`` block) in plain words.

    Examples
    --------
    >>> velocity_text({"model": "constant", "velocity_m_s": 2500.0, "default_fallback": False})
    'velocity 2500 m/s (constant)'
    >>> velocity_text({"model": "linear", "v0_m_s": 1800, "k_per_s": 0.6})
    'velocity v(z) = 1800 m/s + 0.6/s × z'
    >>> velocity_text({"model": "constant", "velocity_m_s": 3000.0, "default_fallback": True})
    'velocity 3000 m/s (constant; default velocity (none given): depths approximate)'
    """
    vel = vel or {}
    model = vel.get("model", "none")
    if model == "constant" and vel.get("velocity_m_s") is not None:
        text, extra = f"velocity {_num(vel['velocity_m_s'])} m/s", ["constant"]
    elif model == "linear" and vel.get("v0_m_s") is not None:
        text, extra = f"velocity v(z) = {_num(vel['v0_m_s'])} m/s + {_num(vel.get('k_per_s', 0))}/s × z", []
    elif model == "table":
        n = len(vel.get("twt_ms") or [])
        src = f" from {vel['source']}" if vel.get("source") else ""
        text, extra = f"velocity table{src}", [f"{vel.get('kind', 'interval')}, {n} points"]
    elif model == "section":
        lo_hi = vel.get("interval_velocity_range_m_s") or []
        rng = f", {_num(lo_hi[0])}-{_num(lo_hi[1])} m/s" if len(lo_hi) == 2 else ""
        text, extra = f"velocity SEG-Y {vel.get('source') or ''}".rstrip(), [f"{vel.get('kind', 'interval')}{rng}"]
    elif model == "none":
        return "depth section: no velocity needed"
    else:
        text, extra = f"velocity model {model}", []
    if vel.get("default_fallback"):
        extra.append(DEFAULT_VELOCITY_FLAG)
    return text + (f" ({'; '.join(extra)})" if extra else "")


def velocity_label(vel) -> str:
    """A short label of a result's velocity model for a table cell.

    Examples
    --------
    >>> velocity_label({"model": "constant", "velocity_m_s": 2800.0})
    'constant 2800 m/s'
    >>> velocity_label({"model": "linear", "v0_m_s": 1800.0, "k_per_s": 0.6})
    'linear 1800 m/s + 0.6/s z'
    >>> velocity_label({"model": "none"})
    'none (depth section)'
    """
    vel = vel or {}
    model = vel.get("model", "none")
    if model == "constant" and vel.get("velocity_m_s") is not None:
        return f"constant {_num(vel['velocity_m_s'])} m/s"
    if model == "linear" and vel.get("v0_m_s") is not None:
        return f"linear {_num(vel['v0_m_s'])} m/s + {_num(vel.get('k_per_s', 0))}/s z"
    if model in ("table", "section"):
        src = vel.get("source")
        return f"{model} {src.replace(chr(92), '/').rsplit('/', 1)[-1]}" if src else str(model)
    if model == "none":
        return "none (depth section)"
    return str(model)


def default_velocity_used(vel) -> bool:
    """True when a result's ``velocity`` block says the package default was used (no velocity given)."""
    return bool((vel or {}).get("default_fallback"))
