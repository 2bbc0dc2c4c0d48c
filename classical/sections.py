"""Section geometry: the polygon route and the named-shape registry.

This module is the public face of :mod:`classical.geometry` (outline, properties, first
moments, chords) and :mod:`classical.shapes` (outline builders and closed forms); it
adds :data:`SHAPES` and :func:`section_outline`, which builds an outline by shape name::

    outline = section_outline("i", depth=300, flange_width=150, flange_thickness=10.7,
                              web_thickness=7.1, root_radius=15)
"""

from __future__ import annotations

import inspect
from collections.abc import Callable, Sequence

import numpy as np

from classical.arcs import FACET_SAGITTA, facet_ring
from classical.geometry import (
    Outline,
    SectionProperties,
    chord_length,
    chord_length_x,
    chord_segments,
    chord_segments_x,
    first_moment_above,
    first_moment_right,
    polygon_properties,
)
from classical.shapes import (
    angle,
    angle_properties,
    box,
    box_properties,
    channel,
    channel_properties,
    circle,
    circle_properties,
    i,
    i_properties,
    polygon,
    rectangle,
    rectangle_properties,
    tee,
    tee_properties,
    tube,
    tube_properties,
)

__all__ = [
    "SHAPES",
    "Outline",
    "arc_polygon",
    "split_vertices",
    "SectionProperties",
    "angle",
    "angle_properties",
    "box",
    "box_properties",
    "channel",
    "channel_properties",
    "chord_length",
    "chord_length_x",
    "chord_segments",
    "chord_segments_x",
    "circle",
    "circle_properties",
    "first_moment_above",
    "first_moment_right",
    "i",
    "i_properties",
    "polygon",
    "polygon_properties",
    "rectangle",
    "rectangle_properties",
    "section_outline",
    "tee",
    "tee_properties",
    "tube",
    "tube_properties",
]

#: shape name -> outline builder taking keyword parameters
SHAPES: dict[str, Callable[..., Outline]] = {}
SHAPES["rectangle"] = rectangle
SHAPES["circle"] = circle
SHAPES["tube"] = tube
SHAPES["box"] = box
SHAPES["i"] = i
SHAPES["channel"] = channel
SHAPES["tee"] = tee
SHAPES["angle"] = angle


def split_vertices(ring: Sequence[Sequence[float]]) -> tuple[np.ndarray, np.ndarray]:
    """Vertices ``[x, y]`` or ``[x, y, bulge]`` -> ((n, 2) points, (n,) bulges).

    The bulge of vertex k belongs to the edge from vertex k to the next (0 = straight);
    see :mod:`classical.arcs`.
    """
    pts = np.asarray([(float(v[0]), float(v[1])) for v in ring], dtype=float)
    bulges = np.asarray([float(v[2]) if len(v) > 2 else 0.0 for v in ring], dtype=float)
    return pts, bulges


def arc_polygon(points: Sequence[Sequence[float]],
                holes: Sequence[Sequence[Sequence[float]]] = ()) -> Outline:
    """:func:`classical.shapes.polygon` whose vertices may carry a bulge (arc edges).

    Arcs are faceted within ``classical.arcs.FACET_SAGITTA`` (1e-6) of the radius, so the
    polygon route's area, second moments and Q are those of the true arcs to a few parts
    per million (the constant gives the reasoning).
    """
    rings = [split_vertices(points)] + [split_vertices(h) for h in holes]
    outer, *inner = [facet_ring(p, b, FACET_SAGITTA) for p, b in rings]
    return polygon(outer, inner)


SHAPES["polygon"] = arc_polygon  # polygon() with arc edges faceted (classical.arcs)


def section_outline(shape: str, **params: object) -> Outline:
    """Build the outline of a registered shape from keyword parameters.

    Raises
    ------
    ValueError
        For an unknown shape (listing the valid ones), an unknown or missing parameter
        (naming it and listing the accepted ones), or invalid dimensions.
    """
    if shape not in SHAPES:
        raise ValueError(f"unknown shape {shape!r}; valid shapes: {', '.join(sorted(SHAPES))}")
    builder = SHAPES[shape]
    accepted = inspect.signature(builder).parameters
    names = ", ".join(accepted)
    for name in params:
        if name not in accepted:
            raise ValueError(f"shape {shape!r} has no parameter {name!r}; parameters: {names}")
    for name, p in accepted.items():
        if p.default is inspect.Parameter.empty and name not in params:
            raise ValueError(f"shape {shape!r} needs parameter {name!r}; parameters: {names}")
    return builder(**params)
