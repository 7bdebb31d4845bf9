"""Plugin discovery through entry points.

Pickers, metrics and classifiers are found in the entry-point groups
``clinometry.pickers``, ``clinometry.metrics`` and ``clinometry.classifiers``
with :func:`importlib.metadata.entry_points`.  The built-ins are registered
the same way in ``setup.cfg``, so there is one path for everything.

Discovery is lazy and cached.  Listing plugins warns about a broken one and
goes on; selecting a broken plugin by name lets its import error through
(chained in a :class:`~clinometry.errors.PluginError`); an unknown name gets
the list of installed ones.
"""

from __future__ import annotations

import functools
import inspect
import logging
import warnings
from importlib.metadata import EntryPoint, entry_points

from .errors import ClinometryWarning, PluginError

__all__ = ["GROUPS", "list_plugins", "load_plugin", "plugin_names", "plugin_parameters", "plugin_description"]

logger = logging.getLogger(__name__)

#: short kind name -> entry-point group
GROUPS = {
    "picker": "clinometry.pickers",
    "metric": "clinometry.metrics",
    "classifier": "clinometry.classifiers",
}


def _group(kind: str) -> str:
    try:
        return GROUPS[kind]
    except KeyError:
        raise PluginError(f"unknown plugin kind {kind!r}; known kinds: {', '.join(GROUPS)}") from None


@functools.lru_cache(maxsize=None)
def _entry_points(group: str) -> tuple[EntryPoint, ...]:
    eps = entry_points(group=group)
    # one entry per name; the first wins, duplicates are reported
    seen: dict[str, EntryPoint] = {}
    for ep in eps:
        if ep.name in seen and seen[ep.name].value != ep.value:
            warnings.warn(
                f"two {group} plugins are named {ep.name!r} ({seen[ep.name].value} and {ep.value}); using the first",
                ClinometryWarning,
                stacklevel=3,
            )
            continue
        seen.setdefault(ep.name, ep)
    return tuple(sorted(seen.values(), key=lambda e: e.name))


def plugin_names(kind: str) -> list:
    """Names of the installed plugins of one kind, sorted, without loading them."""
    return [ep.name for ep in _entry_points(_group(kind))]


def list_plugins(kind: str) -> dict:
    """Installed plugins of one kind, name -> loaded callable.

    A plugin that fails to load is left out with a warning naming it.
    """
    out = {}
    for ep in _entry_points(_group(kind)):
        try:
            out[ep.name] = ep.load()
        except Exception as err:  # a third-party plugin may fail in any way
            warnings.warn(
                f"{kind} plugin {ep.name!r} ({ep.value}) could not be loaded: {type(err).__name__}: {err}",
                ClinometryWarning,
                stacklevel=2,
            )
    return out


def load_plugin(kind: str, name: str):
    """Load one plugin by name.

    Raises
    ------
    PluginError
        Unknown name (the message lists the installed ones), or the plugin's
        own import error, chained.
    """
    eps = {ep.name: ep for ep in _entry_points(_group(kind))}
    if name not in eps:
        known = ", ".join(sorted(eps)) or "none"
        raise PluginError(f"no {kind} plugin named {name!r}; installed: {known}")
    try:
        obj = eps[name].load()
    except Exception as err:
        raise PluginError(f"{kind} plugin {name!r} ({eps[name].value}) failed to load: {type(err).__name__}: {err}") from err
    if not callable(obj):
        raise PluginError(f"{kind} plugin {name!r} ({eps[name].value}) is not callable")
    return obj


def plugin_parameters(func) -> dict:
    """Keyword options of a plugin callable, name -> default (``inspect.Parameter.empty`` if required)."""
    try:
        sig = inspect.signature(func)
    except (TypeError, ValueError):
        return {}
    return {
        p.name: p.default
        for p in sig.parameters.values()
        if p.kind == inspect.Parameter.KEYWORD_ONLY
    }


def plugin_description(func) -> str:
    """First line of a plugin's docstring."""
    doc = inspect.getdoc(func) or ""
    return doc.strip().splitlines()[0] if doc.strip() else ""


def _clear_cache() -> None:
    """Forget discovered entry points (used by tests after installing a plugin)."""
    _entry_points.cache_clear()
