"""List the installed pickers, metrics and classifiers.

Each plugin is shown with its name, where it comes from (entry point), the
first line of its docstring and its keyword options with their defaults.
A plugin that cannot be loaded is listed as broken, and a warning line on
stderr names it; the others are still listed.

Plugins are found in the entry-point groups clinometry.pickers,
clinometry.metrics and clinometry.classifiers; register your own in your
package's metadata to have them listed here and selectable with --picker or
--classifier.
"""

from __future__ import annotations

import inspect
import sys

from .._plugins import GROUPS, plugin_description, plugin_names, plugin_parameters
from ..errors import PluginError

DESCRIPTION = "list installed pickers, metrics and classifiers with their options"
EXAMPLE = "clinometry plugins --kind classifier"

__all__ = ["DESCRIPTION", "EXAMPLE", "configure", "run"]


def configure(parser) -> None:
    """Add the options of ``clinometry plugins`` to ``parser``."""
    parser.add_argument("--kind", choices=sorted(GROUPS), help="list only this kind of plugin")


def _default(v) -> str:
    return "required" if v is inspect.Parameter.empty else repr(v)


def run(args) -> int:
    """Print the installed plugins; 0 even when some are broken (they are named on stderr)."""
    from .._plugins import load_plugin

    kinds = [args.kind] if args.kind else list(GROUPS)
    for kind in kinds:
        group = GROUPS[kind]
        print(f"{kind}s ({group}):")
        names = plugin_names(kind)
        if not names:
            print("  (none installed)")
        for name in names:
            try:
                func = load_plugin(kind, name)
            except PluginError as err:
                print(f"  {name}  BROKEN (see warning)")
                print(f"clinometry: warning: {kind} plugin {name!r} cannot be used: {err}", file=sys.stderr)
                continue
            where = f"{getattr(func, '__module__', '?')}:{getattr(func, '__qualname__', name)}"
            print(f"  {name}  [{where}]")
            desc = plugin_description(func)
            if desc:
                print(f"      {desc}")
            params = plugin_parameters(func)
            if params:
                opts = ", ".join(f"{k}={_default(v)}" for k, v in params.items())
                print(f"      options: {opts}")
    return 0
