"""Write haunched-bracket.dxf, the drawing of cases/haunched-bracket.toml (ezdxf).

A 12 mm bracket plate welded to a column face along x = 0 (0 <= y <= 300 mm), its top edge
level at y = 300 out to the tip at x = 350, the tip 120 mm deep, and the underside one
circular arc (the haunch) from the column's bottom corner (0, 0), where it leaves the column
face at a right angle, up to the tip's bottom corner (350, 180). The arc is tangent to the
x axis at (0, 0), so its centre is (0, R) with R = (350^2 + 180^2) / (2 x 180) = 430.28 mm.

The outline is on layer BRACKET (three LINEs and one ARC, as a drafter draws it); a sheet
border and a title on layers SHEET and NOTES show that only the chosen layer is read.
Run from anywhere: `python cases/drawings/make_haunched_bracket.py`; the file it writes is
byte-for-byte the committed one with the same ezdxf release (fixed handles, dates and ids;
the release is written into the file).
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import ezdxf

HERE = Path(__file__).resolve().parent
TIP, DEPTH, TIP_DEPTH = 350.0, 300.0, 120.0
R = (TIP**2 + (DEPTH - TIP_DEPTH) ** 2) / (2 * (DEPTH - TIP_DEPTH))


def drawing() -> ezdxf.document.Drawing:
    doc = ezdxf.new("R2010", setup=False)
    doc.units = ezdxf.units.MM                      # $INSUNITS = 4
    for name in ("BRACKET", "SHEET", "NOTES"):
        doc.layers.add(name)
    msp = doc.modelspace()
    on = {"layer": "BRACKET"}
    y_tip = DEPTH - TIP_DEPTH
    end = math.degrees(math.atan2(y_tip - R, TIP))  # the tip corner seen from the centre
    msp.add_arc((0.0, R), R, 270.0, 360.0 + end, dxfattribs=on)   # (0, 0) -> (350, 180)
    msp.add_line((TIP, y_tip), (TIP, DEPTH), dxfattribs=on)
    msp.add_line((TIP, DEPTH), (0.0, DEPTH), dxfattribs=on)
    msp.add_line((0.0, DEPTH), (0.0, 0.0), dxfattribs=on)
    msp.add_lwpolyline([(-60, -60), (440, -60), (440, 360), (-60, 360)], close=True,
                       dxfattribs={"layer": "SHEET"})
    msp.add_text("BRACKET PLATE BP-2, 12 THK, S355", height=8,
                 dxfattribs={"layer": "NOTES", "insert": (100, -45)})
    return doc


def main() -> None:
    out = Path(sys.argv[1]) if len(sys.argv) > 1 else HERE / "haunched-bracket.dxf"
    ezdxf.options.write_fixed_meta_data_for_testing = True   # fixed dates and ids
    drawing().saveas(out)
    print(f"wrote {out.name}: arc radius {R:.4f} mm")


if __name__ == "__main__":
    main()
