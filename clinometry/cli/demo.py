"""clinometry demo (being built)."""

from ..errors import ClinometryError

DESCRIPTION = "demo (being built)"
EXAMPLE = "clinometry demo --help"


def configure(parser):
    pass


def run(args):
    raise ClinometryError("'demo' is not available yet in this build")
