"""Stated limits of a case and of a sweep: each one refused with exit 2 naming its key.

They keep a single case (or sweep) within what one check can finish in minutes on a
workstation; none of them changes a result. The numbers are ours (common practice for
input guards, not from a standard): each sits well above any member an engineer would
draw by hand and well below the sizes that a hostile-input probe showed to run for minutes.
"""

from __future__ import annotations

__all__ = ["MAX_FILE_BYTES", "MAX_TITLE", "MAX_CUTS", "MAX_HOLES", "MAX_POINTS",
           "MAX_SWEEP_POINTS", "MAX_CUTOUTS", "MAX_ZONES", "MAX_PLACEMENTS", "MAX_REFINE",
           "MAX_NESTING", "MIN_EXTENT", "MAX_EXTENT", "MAX_OFFSET", "THICKNESS_RATIO",
           "NUMBER_RANGE"]

MAX_FILE_BYTES = 4 * 1024 * 1024   # a case file is read with this cap (4 MiB)
MAX_TITLE = 200          # characters in a title (it heads every report)
MAX_CUTS = 50            # entries of check.cuts
MAX_HOLES = 100          # holes of a member (geometry.holes) or of a section polygon
MAX_CUTOUTS = 20         # geometry.cutouts
MAX_ZONES = 20           # geometry.zones
MAX_PLACEMENTS = 50      # [[supports]] and [[loads]] entries, each
MAX_REFINE = 50          # [[mesh.refine]] entries
MAX_POINTS = 2000        # points of a polygon outline (all rings of a section together)
MAX_SWEEP_POINTS = 10_000  # points of one sweep: the product of every --vary count
MAX_NESTING = 20         # arrays/tables nested in a case file (a case needs 4)

# Scale (fem.case.sizing.check_scale): refused as "out of scale", naming the key.
# gmsh's geometric tolerances are absolute: measured here (a 3:1 plate with a hole), a
# member 3e-7 units across meshed to nothing and one 3e5 across crashed gmsh, while 3e-5
# and 1e5 meshed well; a 60 m girder in mm (6e4) is inside.
MIN_EXTENT = 1e-4        # a member's or section's larger side, in its length unit
MAX_EXTENT = 1e5
MAX_OFFSET = 1e6         # |coordinates| at most this x the extent (precision of the mesh)
THICKNESS_RATIO = 1e9    # thickness / extent within 1/THICKNESS_RATIO .. THICKNESS_RATIO
NUMBER_RANGE = 1e60      # a nominal stress, and stress / E, within 1/NUMBER_RANGE ..
                         # NUMBER_RANGE: their squares (von Mises, energies) stay finite
