"""Sections: properties from dimensions and the catalogue of standard sizes.

Classification (Table 5.2) is a clause function: `postproc.ec3.classification`.

`build_sections(specs)` turns the user's section rows (catalogue designation, dimensions, or
explicit properties) into the sections table every later stage reads. Index `section`; columns,
all SI:

- `shape` ('I', 'RHS', 'CHS', 'GENERIC'), `fabrication` ('rolled', 'welded', 'hot-finished',
  'cold-formed', ''), `designation` (the catalogue name, '' when given by dimensions);
- dimensions `h, b, t_w, t_f, r, a_w, t, r_o` in m (NaN where not applicable): depth h along z,
  width b along y (for CHS h = b = outside diameter), web and flange thickness, root radius,
  weld throat, hollow-section wall and outer corner radius;
- `A, Av_z, Av_y` (m2; shear areas of 6.2.6(3) with eta = 1.0, Av_z for V_z along the web),
  `I_y, I_z` (m4), `W_el_y, W_el_z, W_pl_y, W_pl_z` (m3), `i_y, i_z` (m), `I_t` (m4), `I_w` (m6),
  `t_max` (m, thickest plate: it selects f_y in Table 3.1);
- `given_class` (NaN unless the user gave a class);
- plate parts for Table 5.2: `c_web, t_web, c_flange, t_flange` (m). I: web c = h - 2 t_f - 2 r
  (welded: - 2 sqrt(2) a), flange outstand c = (b - t_w - 2 r) / 2 (welded: - sqrt(2) a). RHS:
  h - 3 t (web, the walls along z) and b - 3 t (flange, the walls along y). CHS: c_web = d,
  t_web = t.

See docs/sections.md for the input columns and how each property is computed.
"""

from .builder import COLUMNS, build_sections
from .listing import catalogue_listing

__all__ = ["COLUMNS", "build_sections", "catalogue_listing"]
