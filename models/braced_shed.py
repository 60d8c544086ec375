"""Packing shed at the orchard cooperative: a three-bay pitched portal shed with rod bracing (3D).

An invented example. Four portal frames across X (span 12 m, eaves 5.0 m, apex 6.0 m at
X = 6 m) at Y = 0, 5, 10, 15 m; fixed column bases; rigid column-rafter and apex joints.
Along Y: pinned eaves struts and a pinned ridge tie join the frames, and the side walls
(X = 0 and X = 12 m) are braced in the two end bays by crossed round rods (truss elements of a
material that carries no compression: a slack rod carries nothing). Purlins (every 1.5 m along
the rafters) and side rails (at 2.0 m and 4.0 m) are not modelled: the project file declares
them as restraints along the members. Units N and m. Z up.

Orientation: every element's OpenSees vecxz points along the web (rafters, struts: +Z; columns:
+X), so the section's major axis is OpenSees local y: the project file says major_axis = "y",
and the elastic properties are given with Iy the major-axis value.

Element tags: columns 1000 + 10 frame + side, rafters 2000 + 10 frame + half, eaves struts
3000 + 10 side + bay, ridge tie 3100 + bay, rods 4000 + 100 side + 10 bay + k.

Load patterns (characteristic values):
  1 cladding, purlins and self-weight, 0.35 kN/m2 on the roof (permanent)
  2 snow, 0.75 kN/m2 on the roof (snow)
  3 wind across the shed (+X), 0.6 kN/m2 on the wall at X = 0 (wind)
  4 wind along the shed (+Y), 0.6 kN/m2 on the gable at Y = 0 (wind)
  5 wind along the shed (-Y), 0.6 kN/m2 on the gable at Y = 15 m (wind)

Run alone to see the model summary: python models/braced_shed.py
"""

import openseespy.opensees as ops

E, G = 210e9, 81e9
# catalogue values (A cm2, I_y cm4, I_z cm4, I_t cm4) as computed by postproc.sections
SECTIONS = {"HEA 240": (76.84, 7763.2, 2768.8, 41.55), "IPE 270": (45.95, 5789.8, 419.87, 15.94),
            "IPE 200": (28.48, 1943.2, 142.37, 6.98), "IPE 160": (20.09, 869.29, 68.31, 3.60),
            "CHS 76.1x4": (9.06, 59.06, 59.06, 118.1)}
SPAN, EAVES, APEX = 12.0, 5.0, 6.0
FRAMES_Y = (0.0, 5.0, 10.0, 15.0)
BRACED_BAYS = (0, 2)                 # the end bays of each side wall
ROD_MATERIAL = 1
TRANSF = {"column": 1, "roof": 2}


def _element(tag: int, i: int, j: int, section: str, transf: int, *release) -> None:
    A, Iy, Iz, It = SECTIONS[section]
    ops.element("elasticBeamColumn", tag, i, j, A * 1e-4, E, G, It * 1e-8, Iy * 1e-8, Iz * 1e-8,
                transf, *release)


def build_model() -> dict:
    """Build the shed in the OpenSees domain; returns a short description."""
    ops.wipe()
    ops.model("basic", "-ndm", 3, "-ndf", 6)
    ops.geomTransf("Linear", TRANSF["column"], 1.0, 0.0, 0.0)
    ops.geomTransf("Linear", TRANSF["roof"], 0.0, 0.0, 1.0)
    # tension only: no stiffness and no force in compression (a slack rod)
    ops.uniaxialMaterial("Elastic", ROD_MATERIAL, E, 0.0, 0.0)
    base, eaves, apex = {}, {}, {}
    for f, y in enumerate(FRAMES_Y):
        for side, x in enumerate((0.0, SPAN)):
            base[f, side], eaves[f, side] = 10 * f + side + 1, 100 + 10 * f + side + 1
            ops.node(base[f, side], x, y, 0.0)
            ops.node(eaves[f, side], x, y, EAVES)
            ops.fix(base[f, side], 1, 1, 1, 1, 1, 1)
        apex[f] = 200 + 10 * f
        ops.node(apex[f], SPAN / 2, y, APEX)
    rafters = {}
    for f in range(len(FRAMES_Y)):
        for side in (0, 1):
            _element(1000 + 10 * f + side, base[f, side], eaves[f, side], "HEA 240",
                     TRANSF["column"])
            rafters[f, side] = 2000 + 10 * f + side
            _element(rafters[f, side], eaves[f, side], apex[f], "IPE 270", TRANSF["roof"])
    for bay in range(len(FRAMES_Y) - 1):
        for side in (0, 1):
            _element(3000 + 10 * side + bay, eaves[bay, side], eaves[bay + 1, side], "IPE 200",
                     TRANSF["roof"])
        _element(3100 + bay, apex[bay], apex[bay + 1], "IPE 160", TRANSF["roof"])
    rods = []
    area = SECTIONS["CHS 76.1x4"][0] * 1e-4
    for side in (0, 1):
        for bay in BRACED_BAYS:
            for k, (a, b) in enumerate(((base[bay, side], eaves[bay + 1, side]),
                                        (base[bay + 1, side], eaves[bay, side]))):
                tag = 4000 + 100 * side + 10 * bay + k
                ops.element("Truss", tag, a, b, area, ROD_MATERIAL)
                rods.append(tag)
    ops.timeSeries("Linear", 1)

    def roof(pattern: int, q: float) -> None:
        """q (N/m2 on plan) on the rafters, per length of rafter (conservative on a 1:6 roof)."""
        ops.pattern("Plain", pattern, 1)
        for (f, _), tag in rafters.items():
            width = 2.5 if f in (0, len(FRAMES_Y) - 1) else 5.0
            ops.eleLoad("-ele", tag, "-type", "-beamUniform", 0.0, -q * width, 0.0)

    roof(1, 0.35e3)
    roof(2, 0.75e3)
    ops.pattern("Plain", 3, 1)   # across: wall at X = 0, half of each column's height to eaves
    for f in range(len(FRAMES_Y)):
        width = 2.5 if f in (0, len(FRAMES_Y) - 1) else 5.0
        ops.load(eaves[f, 0], 0.6e3 * width * EAVES / 2, 0.0, 0.0, 0.0, 0.0, 0.0)
    gable = 0.6e3 * SPAN * (EAVES + APEX) / 2 / 2   # half of the gable's load to the eaves
    ops.pattern("Plain", 4, 1)   # along +Y, on the gable at Y = 0
    for side in (0, 1):
        ops.load(eaves[0, side], 0.0, gable / 2, 0.0, 0.0, 0.0, 0.0)
    ops.pattern("Plain", 5, 1)   # along -Y, on the gable at Y = 15 m
    for side in (0, 1):
        ops.load(eaves[len(FRAMES_Y) - 1, side], 0.0, -gable / 2, 0.0, 0.0, 0.0, 0.0)
    return {"name": "Orchard cooperative packing shed", "rods": rods}


if __name__ == "__main__":
    info = build_model()
    print(info["name"], "nodes:", len(ops.getNodeTags()), "elements:", len(ops.getEleTags()),
          "load patterns:", ops.getPatterns())
