"""clinometry analyze (being built)."""

from ..errors import ClinometryError

DESCRIPTION = "analyze (being built)"
EXAMPLE = "clinometry analyze --help"


def configure(parser):
    pass


def run(args):
    raise ClinometryError("'analyze' is not available yet in this build")
