"""Section geometry: the polygon route and the named-shape registry.

This module is the public face of :mod:`classical.geometry` (outline, properties, first
moments, chords) and :mod:`classical.shapes` (outline builders and closed forms); it
adds :data:`SHAPES` and :func:`section_outline`, which builds an outline by shape name::

    outline = section_outline("i", depth=300, flange_width=150, flange_thickness=10.7,
                              web_thickness=7.1, root_radius=15)
"""

from __future__ import annotations

import inspect
from collections.abc import Callable

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
SHAPES["polygon"] = polygon


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
