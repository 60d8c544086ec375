"""Build the sections table from the user's section specifications.

Each specification row gives one section in one of three ways (see docs/sections.md):
- `designation`: a catalogue name ('IPE 300', 'HE 200 A', 'SHS 100x100x5', 'CHS 168.3x8');
- `shape` with dimensions in mm: 'I' (rolled: h, b, tw, tf, r), 'I-welded' (h, b, tw, tf and an
  optional weld throat a), 'RHS' (h, b, t, optional outer corner radius ro, fabrication),
  'CHS' (h or d = outside diameter, t, fabrication);
- `shape` = 'GENERIC' with the properties in handbook units (cm2, cm3, cm4, cm6, mm).
Parsing and validation go row by row (they are about the user's file); the properties are then
computed for all rows of a shape at once by the vectorised functions of `shapes`.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..errors import SectionError
from . import catalogue as cat
from . import shapes

__all__ = ["COLUMNS", "DIMENSIONS", "DIMENSION_INPUTS", "FABRICATIONS", "GENERIC_INPUTS",
           "GENERIC_REQUIRED", "INPUT_SHAPES", "LARGEST_MM", "LARGEST_PROPERTY", "PARTS",
           "PROPERTIES", "SHAPES", "SQRT2", "build_sections"]

SHAPES = ("I", "RHS", "CHS", "GENERIC")
FABRICATIONS = ("rolled", "welded", "hot-finished", "cold-formed", "")
DIMENSIONS = ["h", "b", "t_w", "t_f", "r", "a_w", "t", "r_o"]
# no steel section has a dimension over 10 m, nor a property over 1e12 in cm units (the largest
# rolled sections' warping constants are near 1e8 cm6); beyond these the unit must be wrong
LARGEST_MM, LARGEST_PROPERTY = 1e4, 1e12
PROPERTIES = ["A", "Av_z", "Av_y", "I_y", "I_z", "W_el_y", "W_el_z", "W_pl_y", "W_pl_z", "i_y",
              "i_z", "I_t", "I_w", "t_max"]
PARTS = ["c_web", "t_web", "c_flange", "t_flange"]
COLUMNS = (["shape", "fabrication", "designation"] + DIMENSIONS + PROPERTIES + ["given_class"]
           + PARTS)
"""Columns of the sections table, in order (index: `section`)."""

INPUT_SHAPES = ("I", "I-welded", "RHS", "CHS", "GENERIC")
DIMENSION_INPUTS = ["h_mm", "b_mm", "tw_mm", "tf_mm", "r_mm", "a_mm", "t_mm", "ro_mm", "d_mm"]
GENERIC_INPUTS = {  # input column -> (sections table column, factor to SI)
    "A_cm2": ("A", 1e-4), "Iy_cm4": ("I_y", 1e-8), "Iz_cm4": ("I_z", 1e-8),
    "Wely_cm3": ("W_el_y", 1e-6), "Welz_cm3": ("W_el_z", 1e-6), "Wply_cm3": ("W_pl_y", 1e-6),
    "Wplz_cm3": ("W_pl_z", 1e-6), "It_cm4": ("I_t", 1e-8), "Iw_cm6": ("I_w", 1e-12),
    "Avz_cm2": ("Av_z", 1e-4), "Avy_cm2": ("Av_y", 1e-4), "tmax_mm": ("t_max", 1e-3),
}
GENERIC_REQUIRED = ("A_cm2", "Iy_cm4", "Iz_cm4", "tmax_mm")
SQRT2 = np.sqrt(2.0)


def _blank(value: object) -> bool:
    if value is None:
        return True
    if isinstance(value, str):
        return value.strip() == ""
    try:
        return bool(pd.isna(value))
    except (TypeError, ValueError):
        return False


class _Row:
    """One specification row with helpers that raise SectionError naming file, row and field."""

    def __init__(self, record: dict, row: int | None, file: str) -> None:
        self.record, self.row, self.file = record, row, file
        self.name = str(record.get("section", ""))

    def error(self, message: str, field: str | None) -> SectionError:
        return SectionError(f"section '{self.name}': {message}", file=self.file, row=self.row,
                            field=field)

    def text(self, field: str) -> str:
        value = self.record.get(field)
        return "" if _blank(value) else str(value).strip()

    def number(self, field: str, *, required: bool, allow_zero: bool = False) -> float:
        """A positive number (mm, cm2 ...) from `field`; NaN when blank and not required."""
        value = self.record.get(field)
        if value is None or _blank(value):
            if required:
                raise self.error("value missing; a positive number is required", field)
            return np.nan
        try:
            number = float(value)
        except (TypeError, ValueError):
            raise self.error(f"'{value}' is not a number", field) from None
        if not np.isfinite(number) or number < 0.0 or (number == 0.0 and not allow_zero):
            allowed = "zero or positive" if allow_zero else "positive"
            raise self.error(f"{value!r} is not allowed; the value must be {allowed}", field)
        limit = LARGEST_MM if field.endswith("_mm") else LARGEST_PROPERTY
        if number > limit:
            raise self.error(f"{value!r} is beyond any steel section (more than {limit:g} in "
                             "the column's unit): is the unit right?", field)
        return number


def _empty_record() -> dict[str, object]:
    rec: dict[str, object] = {c: np.nan for c in COLUMNS}
    rec.update(shape="", fabrication="", designation="")
    return rec


def _check_i(row: _Row, h: float, b: float, tw: float, tf: float, r: float, a: float) -> None:
    if tf >= h / 2.0:
        raise row.error(f"flange thickness {tf:g} mm is not less than half the depth "
                        f"{h:g}/2 mm", "tf_mm")
    if tw >= b:
        raise row.error(f"web thickness {tw:g} mm is not less than the width {b:g} mm", "tw_mm")
    corner = r if r > 0 else a * SQRT2
    field = "r_mm" if r > 0 else "a_mm"
    if h - 2.0 * tf - 2.0 * corner <= 0.0 or (b - tw) / 2.0 - corner <= 0.0:
        what = "root radius" if r > 0 else "weld"
        raise row.error(f"{what} of {corner:g} mm leaves no flat web or flange outstand: the web "
                        f"between flanges is {h - 2 * tf:g} mm and the outstand "
                        f"{(b - tw) / 2:g} mm",
                        field)


def _i_record(row: _Row, h: float, b: float, tw: float, tf: float, r: float, a: float,
              welded: bool) -> dict:
    _check_i(row, h, b, tw, tf, r, 0.0 if np.isnan(a) else a)
    rec = _empty_record()
    rec.update(shape="I", fabrication="welded" if welded else "rolled",
               h=h * 1e-3, b=b * 1e-3, t_w=tw * 1e-3, t_f=tf * 1e-3,
               r=np.nan if welded else r * 1e-3, a_w=a * 1e-3 if welded else np.nan)
    return rec


def _corner_radii(t: np.ndarray, fabrication: np.ndarray, r_o: np.ndarray
                  ) -> tuple[np.ndarray, np.ndarray]:
    """Outer and inner corner radii of RHS: the product standard's when r_o is NaN; with a given
    r_o, cold-formed walls bend at constant thickness (r_i = r_o - t) and hot-finished keep the
    EN 10210-2 proportion r_i = r_o / 1.5."""
    r_o_default, r_i_default = shapes.hollow_corner_radii(t, fabrication)
    cold = np.asarray(fabrication) == "cold-formed"
    given = np.asarray(r_o, dtype=float)
    r_i = np.where(np.isnan(given), r_i_default,
                   np.where(cold, np.maximum(given - t, 0.0), given / 1.5))
    return np.where(np.isnan(given), r_o_default, given), r_i


def _hollow_record(row: _Row, shape: str, h: float, b: float, t: float, r_o: float,
                   fabrication: str) -> dict:
    if t >= min(h, b) / 2.0:
        raise row.error(f"wall thickness {t:g} mm is not less than half the smaller outside "
                        f"dimension {min(h, b):g} mm", "t_mm")
    if shape == "RHS" and not np.isnan(r_o):
        if r_o > min(h, b) / 2.0:
            raise row.error(f"outer corner radius {r_o:g} mm does not fit: it can be at most half "
                            f"the smaller outside dimension, {min(h, b) / 2:g} mm", "ro_mm")
        if fabrication == "cold-formed" and r_o < t:
            raise row.error(f"outer corner radius {r_o:g} mm of a cold-formed section must be at "
                            f"least the wall thickness {t:g} mm", "ro_mm")
    if shape == "RHS":
        r_out, r_in = _corner_radii(np.array(t * 1e-3), np.array(fabrication),
                                    np.array(r_o * 1e-3))
        if r_in > (min(h, b) - 2.0 * t) * 1e-3 / 2.0 + 1e-12:
            field = "t_mm" if np.isnan(r_o) else "ro_mm"
            raise row.error(f"the corners do not fit: inner radius {float(r_in) * 1e3:g} mm (outer "
                            f"{float(r_out) * 1e3:g} mm) exceeds half the inside width "
                            f"{(min(h, b) - 2 * t) / 2:g} mm; the wall is too thick for the size",
                            field)
    rec = _empty_record()
    rec.update(shape=shape, fabrication=fabrication, h=h * 1e-3, b=b * 1e-3, t=t * 1e-3,
               r_o=r_o * 1e-3)
    return rec


def _fabrication(row: _Row) -> str:
    fab = row.text("fabrication").lower().replace(" ", "-").replace("_", "-")
    if fab not in ("hot-finished", "cold-formed"):
        given = row.text("fabrication")
        raise row.error(f"fabrication {given!r} is not allowed for a hollow section; give "
                        f"'hot-finished' or 'cold-formed' (it decides corner radii and the "
                        f"buckling curve, so it is never assumed)", "fabrication")
    return fab


def _from_designation(row: _Row, designation: str) -> dict:
    name = cat.find(designation)
    if name is None:
        close = cat.suggestions(designation)
        hint = f"; did you mean {', '.join(repr(c) for c in close)}?" if close else ""
        raise row.error(f"designation {designation!r} is not in the catalogue (families "
                        f"{', '.join(cat.FAMILIES)}){hint}", "designation")
    dims = cat.catalogue().loc[name]
    if dims["shape"] == "I":
        rec = _i_record(row, dims["h_mm"], dims["b_mm"], dims["tw_mm"], dims["tf_mm"],
                        dims["r_mm"], np.nan, welded=False)
    else:
        rec = _hollow_record(row, dims["shape"], dims["h_mm"], dims["b_mm"], dims["t_mm"],
                             np.nan, dims["fabrication"])
    rec["designation"] = name
    return rec


def _from_dimensions(row: _Row, shape: str) -> dict:
    if shape in ("I", "I-WELDED"):
        welded = shape == "I-WELDED"
        h, b, tw, tf = (row.number(f, required=True) for f in ("h_mm", "b_mm", "tw_mm", "tf_mm"))
        if welded:
            return _i_record(row, h, b, tw, tf, np.nan,
                             row.number("a_mm", required=False, allow_zero=True), welded=True)
        return _i_record(row, h, b, tw, tf, row.number("r_mm", required=True, allow_zero=True),
                         np.nan, welded=False)
    fabrication = _fabrication(row)
    t = row.number("t_mm", required=True)
    if shape == "RHS":
        h, b = row.number("h_mm", required=True), row.number("b_mm", required=True)
        r_o = row.number("ro_mm", required=False, allow_zero=True)
        return _hollow_record(row, "RHS", h, b, t, r_o, fabrication)
    d_field = "d_mm" if _blank(row.record.get("h_mm")) and "d_mm" in row.record else "h_mm"
    d = row.number(d_field, required=True)
    b = row.number("b_mm", required=False)
    if not np.isnan(b) and b != d:
        raise row.error(f"a CHS has one diameter; b_mm = {b:g} differs from {d:g}", "b_mm")
    return _hollow_record(row, "CHS", d, d, t, np.nan, fabrication)


def _generic(row: _Row) -> dict:
    rec = _empty_record()
    rec.update(shape="GENERIC", fabrication="")
    for field, (column, to_si) in GENERIC_INPUTS.items():
        value = row.number(field, required=field in GENERIC_REQUIRED,
                           allow_zero=field in ("Iw_cm6",))
        rec[column] = value * to_si
    return rec


def _given_class(row: _Row) -> float:
    value = row.record.get("class")
    if value is None or _blank(value):
        return np.nan
    try:
        number = float(value)
    except (TypeError, ValueError):
        number = np.nan
    if number not in (1.0, 2.0, 3.0, 4.0):
        raise row.error(f"class {value!r} is not allowed; give 1, 2, 3 or 4 or leave it empty",
                        "class")
    return number


def _parse(row: _Row) -> dict:
    designation, shape = row.text("designation"), row.text("shape").upper().replace(" ", "")
    shape = {"I-ROLLED": "I", "SHS": "RHS", "WELDED-I": "I-WELDED"}.get(shape, shape)
    dims_given = [f for f in DIMENSION_INPUTS + list(GENERIC_INPUTS)
                  if not _blank(row.record.get(f))]
    if designation:
        if dims_given:
            raise row.error(f"give either a designation or dimensions/properties, not both "
                            f"(found {', '.join(dims_given)})", dims_given[0])
        rec = _from_designation(row, designation)
        if shape and shape != rec["shape"]:
            raise row.error(f"shape {row.text('shape')!r} contradicts designation "
                            f"{designation!r}, which is {rec['shape']}", "shape")
    elif shape == "GENERIC":
        rec = _generic(row)
    elif shape in ("I", "I-WELDED", "RHS", "CHS"):
        rec = _from_dimensions(row, shape)
    elif shape:
        raise row.error(f"shape {row.text('shape')!r} is not known; use one of "
                        f"{', '.join(INPUT_SHAPES)} or give a designation", "shape")
    else:
        raise row.error("neither a designation nor a shape is given", "designation")
    rec["given_class"] = _given_class(row)
    return rec


def _compute(table: pd.DataFrame) -> pd.DataFrame:
    """Fill properties and plate parts, vectorised per shape (arrays over all rows of a shape)."""
    t = table  # columns as arrays; rows of other shapes are overwritten below by masks
    shape, fab = t["shape"].to_numpy(), t["fabrication"].to_numpy()

    is_i = shape == "I"
    if is_i.any():
        s = t.loc[is_i]
        welded = (s["fabrication"] == "welded").to_numpy()
        r = np.where(welded, 0.0, s["r"].to_numpy())
        a = np.nan_to_num(s["a_w"].to_numpy())
        h, b, tw, tf = (s[c].to_numpy() for c in ("h", "b", "t_w", "t_f"))
        props = shapes.i_section(h, b, tw, tf, r, rolled=~welded)
        h_w = h - 2.0 * tf
        props["Av_z"], props["Av_y"] = shapes.shear_areas_i(props["A"], h, b, tw, tf, r, welded)
        props["t_max"] = np.maximum(tf, tw)
        props["c_web"] = h_w - 2.0 * r - 2.0 * SQRT2 * a
        props["t_web"] = tw
        props["c_flange"] = (b - tw - 2.0 * r) / 2.0 - SQRT2 * a
        props["t_flange"] = tf
        for key, value in props.items():
            t.loc[is_i, key] = value

    is_rhs = shape == "RHS"
    if is_rhs.any():
        s = t.loc[is_rhs]
        h, b, wall = (s[c].to_numpy() for c in ("h", "b", "t"))
        r_o, r_i = _corner_radii(wall, fab[is_rhs], s["r_o"].to_numpy())
        props = shapes.rhs(h, b, wall, r_o, r_i)
        props["Av_z"], props["Av_y"] = shapes.shear_areas_rhs(props["A"], h, b)
        props["t_max"] = wall
        props["r_o"] = r_o
        # Table 5.2 internal parts: c = h - 3 t and b - 3 t (common practice for hollow sections)
        props["c_web"], props["t_web"] = h - 3.0 * wall, wall
        props["c_flange"], props["t_flange"] = b - 3.0 * wall, wall
        for key, value in props.items():
            t.loc[is_rhs, key] = value

    is_chs = shape == "CHS"
    if is_chs.any():
        s = t.loc[is_chs]
        d, wall = s["h"].to_numpy(), s["t"].to_numpy()
        props = shapes.chs(d, wall)
        props["Av_z"] = props["Av_y"] = shapes.shear_area_chs(props["A"])
        props["t_max"] = wall
        props["c_web"], props["t_web"] = d, wall  # Table 5.2 sheet 3: d / t
        for key, value in props.items():
            t.loc[is_chs, key] = value

    with np.errstate(invalid="ignore", divide="ignore"):
        t["i_y"] = np.sqrt(t["I_y"] / t["A"])
        t["i_z"] = np.sqrt(t["I_z"] / t["A"])
    return t


def build_sections(specs: pd.DataFrame, *, file: str = "sections") -> pd.DataFrame:
    """The sections table (index `section`, columns `COLUMNS` in SI) from specification rows.

    Raises SectionError naming the file, row and field of the first bad entry.
    """
    if "section" not in specs.columns:
        raise SectionError("column 'section' is missing; it names each section as the model uses "
                           "it", file=file, field="section")
    records, names = [], []
    seen: dict[str, int | None] = {}
    for position, record in enumerate(specs.to_dict("records")):
        row_number = record.get("_row")
        row_number = position + 1 if _blank(row_number) else int(row_number)
        row = _Row(record, row_number, file)
        if _blank(record.get("section")):
            raise row.error("the section name is empty", "section")
        name = str(record["section"]).strip()
        if name in seen:
            raise row.error(f"section name '{name}' is given twice (first at row {seen[name]})",
                            "section")
        seen[name] = row_number
        records.append(_parse(row))
        names.append(name)
    table = pd.DataFrame(records, columns=COLUMNS)
    table.index = pd.Index(names, name="section", dtype=object)
    for column in COLUMNS[3:]:
        table[column] = table[column].astype(float)
    return _compute(table)
