"""clinometry synth (being built)."""

from ..errors import ClinometryError

DESCRIPTION = "synth (being built)"
EXAMPLE = "clinometry synth --help"


def configure(parser):
    pass


def run(args):
    raise ClinometryError("'synth' is not available yet in this build")
