"""Workshop annex on the workshop annex: a three-storey, two-bay unbraced (sway) frame (2D).

An invented example. Fixed column bases, rigid beam-column joints, bays of 7.0 m, storeys of
3.6 m, frames at 5.0 m centres. Units N and m. Plane frame in X-Y, Y up.

Load patterns (characteristic values per frame):
  1 floors and roof: slabs, finishes, services, self-weight (permanent)
  2 offices on levels 1 and 2 (imposed, category B)
  3 light storage and a shelving unit in the left bay of level 1 (imposed, category E)
  4 snow on the roof (snow)
  5 wind from the left, as storey forces (wind)
  6 wind from the right (wind)

Run alone to see the model summary: python models/sway_frame.py
"""

import openseespy.opensees as ops

E = 210e9
# Handbook values (A cm2, I_y cm4) of the sections used, as computed by postproc.sections.
SECTIONS = {1: ("HEB 220", 91.04, 8091.0), 2: ("HEB 200", 78.08, 5696.2),
            3: ("IPE 360", 72.73, 16266.0), 4: ("IPE 300", 53.81, 8356.1)}
BAY, STOREY, SPACING = 7.0, 3.6, 5.0
LINES, LEVELS = 3, 3


def node_tag(line: int, level: int) -> int:
    """Column line 0..2, level 0 (ground) .. 3 (roof): tag 100 level + line + 1."""
    return 100 * level + line + 1


def build_model() -> dict:
    """Build the annex frame in the OpenSees domain; returns a short description."""
    ops.wipe()
    ops.model("basic", "-ndm", 2, "-ndf", 3)
    for level in range(LEVELS + 1):
        for line in range(LINES):
            ops.node(node_tag(line, level), line * BAY, level * STOREY)
    for line in range(LINES):
        ops.fix(node_tag(line, 0), 1, 1, 1)
    ops.geomTransf("Linear", 1)
    for tag, (_, A_cm2, I_cm4) in SECTIONS.items():
        ops.section("Elastic", tag, E, A_cm2 * 1e-4, I_cm4 * 1e-8)
    columns, beams = {}, {}
    for level in range(1, LEVELS + 1):
        for line in range(LINES):
            tag = 1000 + 10 * level + line        # columns: 1010 .. 1032
            section = 1 if level == 1 else 2
            ops.element("elasticBeamColumn", tag, node_tag(line, level - 1),
                        node_tag(line, level), section, 1)
            columns[(line, level)] = tag
        for bay in range(LINES - 1):
            tag = 2000 + 10 * level + bay         # beams: 2010 .. 2031
            section = 3 if level < LEVELS else 4
            ops.element("elasticBeamColumn", tag, node_tag(bay, level), node_tag(bay + 1, level),
                        section, 1)
            beams[(bay, level)] = tag
    floors = [t for (b, lv), t in beams.items() if lv < LEVELS]
    roof = [t for (b, lv), t in beams.items() if lv == LEVELS]
    ops.timeSeries("Linear", 1)
    ops.pattern("Plain", 1, 1)
    for t in floors:  # 4.2 kN/m2 slab and finishes, 0.5 kN/m self-weight
        ops.eleLoad("-ele", t, "-type", "-beamUniform", -(4.2e3 * SPACING + 0.5e3))
    for t in roof:    # 1.2 kN/m2 roof build-up
        ops.eleLoad("-ele", t, "-type", "-beamUniform", -(1.2e3 * SPACING + 0.45e3))
    for t in columns.values():  # self-weight and facade, along the column (local x up)
        ops.eleLoad("-ele", t, "-type", "-beamUniform", 0.0, -1.9e3)
    ops.pattern("Plain", 2, 1)  # offices 3.0 kN/m2
    for t in floors:
        ops.eleLoad("-ele", t, "-type", "-beamUniform", -3.0e3 * SPACING)
    ops.pattern("Plain", 3, 1)  # storage 4.0 kN/m2, left bay of level 1, plus a shelving unit
    ops.eleLoad("-ele", beams[(0, 1)], "-type", "-beamUniform", -4.0e3 * SPACING)
    ops.eleLoad("-ele", beams[(0, 1)], "-type", "-beamPoint", -20.0e3, 0.3)
    ops.pattern("Plain", 4, 1)  # snow 0.6 kN/m2
    for t in roof:
        ops.eleLoad("-ele", t, "-type", "-beamUniform", -0.6e3 * SPACING)
    for pattern, sign in ((5, 1.0), (6, -1.0)):
        ops.pattern("Plain", pattern, 1)
        edge = 0 if sign > 0 else LINES - 1
        for level in range(1, LEVELS + 1):  # 1.1 kN/m2 on the facade, half storey at the roof
            height = STOREY if level < LEVELS else STOREY / 2
            ops.load(node_tag(edge, level), sign * 1.1e3 * SPACING * height, 0.0, 0.0)
    return {"name": "Three-storey workshop annex",
            "sections": {t: s[0] for t, s in SECTIONS.items()}}


if __name__ == "__main__":
    info = build_model()
    print(info["name"], "nodes:", len(ops.getNodeTags()), "elements:", len(ops.getEleTags()),
          "load patterns:", ops.getPatterns())
