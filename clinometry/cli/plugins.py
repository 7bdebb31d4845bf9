"""clinometry plugins (being built)."""

from ..errors import ClinometryError

DESCRIPTION = "plugins (being built)"
EXAMPLE = "clinometry plugins --help"


def configure(parser):
    pass


def run(args):
    raise ClinometryError("'plugins' is not available yet in this build")
