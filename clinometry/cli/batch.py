"""clinometry batch (being built)."""

from ..errors import ClinometryError

DESCRIPTION = "batch (being built)"
EXAMPLE = "clinometry batch --help"


def configure(parser):
    pass


def run(args):
    raise ClinometryError("'batch' is not available yet in this build")
