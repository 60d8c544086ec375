"""Storage mezzanine at the valley depot: a braced steel platform on nine columns (3D).

An invented example. Plan 12 m (X, two bays of 6 m) by 8 m (Y, two bays of 4 m), deck at 3.5 m.
Fixed column bases, rigid beam-column joints both ways (columns bend about both axes), diagonal
braces with pinned ends in the two end frames (X = 0 and X = 12 m), bracing the platform along Y;
along X it sways. Units N and m. Z up.

Orientation: every element's OpenSees vecxz points along the web (beams: +Z; columns: +X or +Y),
so the section's major axis is OpenSees local y: the project file says major_axis = "y", and the
elastic properties are given with Iy the major-axis value.

Load patterns (characteristic values):
  1 deck grating, services and self-weight (permanent)
  2 pallet storage on the deck, 6.0 kN/m2 (imposed, category E)
  3 a packing machine on the main beam at Y = 4 m, first bay (imposed, category E)
  4 wind along X, on the cladding of the storage racks above the deck (wind)
  5 wind along Y (wind)

Run alone to see the model summary: python models/platform_3d.py
"""

import openseespy.opensees as ops

E, G = 210e9, 81e9
# Handbook values (A cm2, I_y cm4, I_z cm4, I_t cm4) as computed by postproc.sections.
SECTIONS = {1: ("HEA 200", 53.83, 3692.2, 1335.5, 20.98),
            2: ("IPE 300", 53.81, 8356.1, 603.78, 20.12),
            3: ("IPE 240", 39.12, 3891.6, 283.63, 12.88),
            4: ("SHS 100x100x5", 18.73, 279.43, 279.43, 439.4)}
XS, YS, H = (0.0, 6.0, 12.0), (0.0, 4.0, 8.0), 3.5
TRANSF = {"beam_x": 1, "beam_y": 2, "column_web_x": 3, "column_web_y": 4, "brace": 5}


def _element(tag: int, i: int, j: int, section: int, transf: int, *release) -> None:
    _, A, Iy, Iz, It = SECTIONS[section]
    ops.element("elasticBeamColumn", tag, i, j, A * 1e-4, E, G, It * 1e-8, Iy * 1e-8, Iz * 1e-8,
                transf, *release)


def build_model() -> dict:
    """Build the platform in the OpenSees domain; returns a short description."""
    ops.wipe()
    ops.model("basic", "-ndm", 3, "-ndf", 6)
    base, deck = {}, {}
    for a, x in enumerate(XS):
        for b, y in enumerate(YS):
            base[a, b], deck[a, b] = 10 * a + b + 1, 100 + 10 * a + b + 1
            ops.node(base[a, b], x, y, 0.0)
            ops.node(deck[a, b], x, y, H)
            ops.fix(base[a, b], 1, 1, 1, 1, 1, 1)
    ops.geomTransf("Linear", TRANSF["beam_x"], 0.0, 0.0, 1.0)
    ops.geomTransf("Linear", TRANSF["beam_y"], 0.0, 0.0, 1.0)
    ops.geomTransf("Linear", TRANSF["column_web_x"], 1.0, 0.0, 0.0)
    ops.geomTransf("Linear", TRANSF["column_web_y"], 0.0, 1.0, 0.0)
    ops.geomTransf("Linear", TRANSF["brace"], 1.0, 0.0, 0.0)
    for (a, b), top in deck.items():
        # columns on the middle line (Y = 4 m) turned with their webs along Y, the others along X
        web = "column_web_x" if b == 1 else "column_web_y"
        _element(1000 + 10 * a + b, base[a, b], top, 1, TRANSF[web])
    main, secondary = {}, {}
    for b in range(len(YS)):
        for a in range(len(XS) - 1):
            main[a, b] = 2000 + 10 * b + a
            _element(main[a, b], deck[a, b], deck[a + 1, b], 2, TRANSF["beam_x"])
    for a in range(len(XS)):
        for b in range(len(YS) - 1):
            secondary[a, b] = 3000 + 10 * a + b
            _element(secondary[a, b], deck[a, b], deck[a, b + 1], 3, TRANSF["beam_y"])
    braces = []
    for a in (0, len(XS) - 1):
        for b in range(len(YS) - 1):  # one diagonal per bay of the end frames, pinned ends
            tag = 4000 + 10 * a + b
            _element(tag, base[a, b], deck[a, b + 1], 4, TRANSF["brace"],
                     "-releasez", 3, "-releasey", 3)
            braces.append(tag)
    ops.timeSeries("Linear", 1)
    ops.pattern("Plain", 1, 1)  # grating 0.45 kN/m2 on the main beams, beam self-weight
    for (_a, b), t in main.items():
        width = 2.0 if b != 1 else 4.0
        ops.eleLoad("-ele", t, "-type", "-beamUniform", 0.0, -(0.45e3 * width + 0.42e3), 0.0)
    for t in secondary.values():
        ops.eleLoad("-ele", t, "-type", "-beamUniform", 0.0, -0.31e3, 0.0)
    ops.pattern("Plain", 2, 1)  # pallets 6.0 kN/m2
    for (_a, b), t in main.items():
        width = 2.0 if b != 1 else 4.0
        ops.eleLoad("-ele", t, "-type", "-beamUniform", 0.0, -6.0e3 * width, 0.0)
    ops.pattern("Plain", 3, 1)  # machine: 45 kN at 2.0 m along the first bay of the middle line
    ops.eleLoad("-ele", main[0, 1], "-type", "-beamPoint", 0.0, -45.0e3, 2.0 / 6.0)
    ops.pattern("Plain", 4, 1)  # wind along X: 0.8 kN/m2 on 8 m x 2.5 m of rack cladding
    for b in range(len(YS)):
        ops.load(deck[0, b], 0.8e3 * 8.0 * 2.5 / 3, 0.0, 0.0, 0.0, 0.0, 0.0)
    ops.pattern("Plain", 5, 1)  # wind along Y: 0.8 kN/m2 on 12 m x 2.5 m
    for a in range(len(XS)):
        ops.load(deck[a, 0], 0.0, 0.8e3 * 12.0 * 2.5 / 3, 0.0, 0.0, 0.0, 0.0)
    return {"name": "Valley depot storage mezzanine",
            "sections": {t: s[0] for t, s in SECTIONS.items()}, "braces": braces}


if __name__ == "__main__":
    info = build_model()
    print(info["name"], "nodes:", len(ops.getNodeTags()), "elements:", len(ops.getEleTags()),
          "load patterns:", ops.getPatterns())
