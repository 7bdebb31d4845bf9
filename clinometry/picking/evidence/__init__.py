"""Independent pieces of evidence for a margin candidate.

Each module measures one kind of evidence on the image around a candidate
and returns an :class:`Evidence` record: a score 0..1 (0.5 when the image
says nothing either way), the measured values and a sentence for the
reviewer.  :mod:`~clinometry.picking.decide` combines them, so a margin can
survive one weak piece of evidence.

* :mod:`.tops`: a platform top landward of the break (flat, continuous,
  strong, one polarity);
* :mod:`.faces`: a slope face (reflection energy along the slope, reflection
  dip that agrees with it);
* :mod:`.floors`: a toe and a basin floor flatter than the slope;
* :mod:`.terminations`: reflections that end against the slope (onlap of the
  fill) rather than run parallel to it (drape, folds);
* :mod:`.character`: a change of seismic character across the slope
  (layering that does not continue from platform to basin).
"""

from .record import Evidence

__all__ = ["Evidence"]
