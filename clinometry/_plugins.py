"""Plugin discovery through entry points, and the checks every plugin passes (the machinery).

Pickers, metrics and classifiers are found in the entry-point groups
``clinometry.pickers``, ``clinometry.metrics`` and ``clinometry.classifiers``
with :func:`importlib.metadata.entry_points`.  The built-ins are registered
the same way in ``setup.cfg``, so there is one path for everything.

Discovery is lazy and cached.  Listing plugins warns about a broken one and
goes on; selecting a broken plugin by name lets its import error through
(chained in a :class:`~clinometry.errors.PluginError`); an unknown name gets
the list of installed ones.

Loading checks the plugin's call signature against its kind
(:func:`check_signature`): one positional argument for the data, every
option keyword-only and named (no ``*args`` or ``**kwargs``), and the
keywords clinometry always passes (``velocity`` to a picker, ``thresholds``
to a classifier).  Before a call, :func:`check_options` refuses options the
plugin does not declare and required options nobody gives, with a message
naming the plugin and its options.  The protocols themselves are described
in the public module :mod:`clinometry.plugins`.
"""

from __future__ import annotations

import functools
import inspect
import logging
import warnings
from importlib.metadata import EntryPoint, entry_points

from .errors import ClinometryWarning, PluginError

__all__ = [
    "GROUPS",
    "PROTOCOLS",
    "list_plugins",
    "load_plugin",
    "plugin_names",
    "plugin_parameters",
    "plugin_description",
    "check_signature",
    "check_options",
    "clear_cache",
]

logger = logging.getLogger(__name__)

#: short kind name -> entry-point group
GROUPS = {
    "picker": "clinometry.pickers",
    "metric": "clinometry.metrics",
    "classifier": "clinometry.classifiers",
}


#: per kind: what the one positional argument is, and the keywords clinometry
#: passes to every plugin of that kind itself
PROTOCOLS = {
    "picker": ("section", ("velocity",)),
    "metric": ("geometry", ()),
    "classifier": ("values", ("thresholds",)),
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

    A plugin that fails to load or whose signature does not fit its kind
    (:func:`check_signature`) is left out with a warning naming it.
    """
    out = {}
    for ep in _entry_points(_group(kind)):
        try:
            obj = ep.load()
            check_signature(kind, ep.name, obj, where=ep.value)
        except PluginError as err:
            warnings.warn(f"{kind} plugin {ep.name!r} cannot be used: {err}", ClinometryWarning, stacklevel=2)
            continue
        except Exception as err:  # a third-party plugin may fail in any way
            warnings.warn(
                f"{kind} plugin {ep.name!r} ({ep.value}) could not be loaded: {type(err).__name__}: {err}",
                ClinometryWarning,
                stacklevel=2,
            )
            continue
        out[ep.name] = obj
    return out


def load_plugin(kind: str, name: str):
    """Load one plugin by name and check its signature.

    Raises
    ------
    PluginError
        Unknown name (the message lists the installed ones), the plugin's
        own import error (chained), or a callable whose signature does not
        fit its kind (see :func:`check_signature`).
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
    check_signature(kind, name, obj, where=eps[name].value)
    return obj


_POSITIONAL = (inspect.Parameter.POSITIONAL_ONLY, inspect.Parameter.POSITIONAL_OR_KEYWORD)


def check_signature(kind: str, name: str, func, *, where: str = "") -> inspect.Signature:
    """Refuse a plugin callable whose signature does not fit its kind.

    A plugin takes its data as the one positional argument (a section, a
    margin geometry, or a mapping of metric values) and every option as a
    named keyword-only parameter, with no ``*args`` or ``**kwargs``, so that
    options can be listed, checked and recorded.  A picker must accept
    ``velocity=`` and a classifier ``thresholds=`` (clinometry passes them).

    Parameters
    ----------
    kind : {"picker", "metric", "classifier"}
    name : str
        Plugin name, for messages.
    func : callable
    where : str
        Where it comes from (entry-point value), for messages.

    Returns
    -------
    inspect.Signature

    Raises
    ------
    PluginError
        Naming the plugin, what does not fit and what to change.
    """
    _group(kind)  # a known kind
    data, passed = PROTOCOLS[kind]
    label = f"{kind} plugin {name!r}" + (f" ({where})" if where else "")
    try:
        sig = inspect.signature(func)
    except (TypeError, ValueError):
        raise PluginError(f"{label}: its call signature cannot be read; make it a plain Python function") from None
    params = list(sig.parameters.values())
    for p in params:
        if p.kind in (inspect.Parameter.VAR_POSITIONAL, inspect.Parameter.VAR_KEYWORD):
            star = "*" if p.kind == inspect.Parameter.VAR_POSITIONAL else "**"
            raise PluginError(
                f"{label} takes {star}{p.name}; clinometry passes only named options, so declare each "
                "option as a keyword-only parameter (after '*') with its default"
            )
    positional = [p for p in params if p.kind in _POSITIONAL]
    if len(positional) != 1 or positional[0].default is not inspect.Parameter.empty:
        raise PluginError(
            f"{label} must take the {data} as its one positional argument, then keyword-only options "
            f"(after '*'); its signature is {name}{sig}"
        )
    keywords = plugin_parameters(func)
    for k in passed:
        if k not in keywords:
            raise PluginError(f"{label} has no keyword {k!r}; every {kind} is called with {k}=, so declare it")
    return sig


def check_options(kind: str, name: str, func, options, *, passed=()) -> None:
    """Refuse options a plugin does not declare, and required options that nobody gives.

    Parameters
    ----------
    kind, name, func
        As for :func:`check_signature` (the loaded plugin).
    options : mapping of str -> object
        The keyword options about to be passed.
    passed : iterable of str
        Keywords clinometry passes besides ``options`` (e.g. ``velocity``).

    Raises
    ------
    PluginError
        An unknown option (the message lists the plugin's options) or a
        missing required one.

    Examples
    --------
    >>> def tilt(geometry, *, limit_deg=5.0):
    ...     return {}
    >>> check_options("metric", "tilt", tilt, {"limit_deg": 2.0})
    >>> check_options("metric", "tilt", tilt, {"limit": 2.0})
    Traceback (most recent call last):
    ...
    clinometry.errors.PluginError: metric plugin 'tilt' has no option 'limit'; its options: limit_deg
    """
    keywords = plugin_parameters(func)
    unknown = [k for k in options if k not in keywords]
    if unknown:
        own = ", ".join(keywords) or "none"
        raise PluginError(
            f"{kind} plugin {name!r} has no option {', '.join(repr(k) for k in unknown)}; its options: {own}"
        )
    given = set(options) | set(passed)
    missing = [k for k, default in keywords.items() if default is inspect.Parameter.empty and k not in given]
    if missing:
        raise PluginError(
            f"{kind} plugin {name!r} needs the option(s) {', '.join(repr(k) for k in missing)}, which were not given"
        )


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


def clear_cache() -> None:
    """Forget the discovered entry points, so plugins installed since are found."""
    _entry_points.cache_clear()
