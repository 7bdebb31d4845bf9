"""clinometry inspect (being built)."""

from ..errors import ClinometryError

DESCRIPTION = "inspect (being built)"
EXAMPLE = "clinometry inspect --help"


def configure(parser):
    pass


def run(args):
    raise ClinometryError("'inspect' is not available yet in this build")
