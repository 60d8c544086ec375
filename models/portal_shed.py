"""Implement shed of a growers' cooperative: one single-bay pitched portal frame (2D).

An invented example. Pinned column bases, rigid knees and apex, span 16 m, eaves 5.0 m, apex
6.4 m, frames at 6.0 m centres. Units N and m. Plane frame in X-Y, Y up.

Load patterns (characteristic values per frame):
  1 self-weight, purlins and cladding (permanent)
  2 snow, uniform on plan (snow)
  3 maintenance load on the roof (imposed, category H; never with snow)
  4 wind from the left: pressure on the left wall, suction on the right wall and on the roof
  5 wind from the right (mirror of 4)

Run alone to see the model summary: python models/portal_shed.py
"""

import math

import openseespy.opensees as ops

E = 210e9
# Handbook values (A cm2, I_y cm4) of the sections used, as computed by postproc.sections.
SECTIONS = {1: ("IPE 400", 84.46, 23128.0), 2: ("IPE 300", 53.81, 8356.1)}
SPAN, EAVES, APEX, SPACING = 16.0, 5.0, 6.4, 6.0
RAFTER_PIECES = 4  # elements per rafter, so point positions along the rafter are nodes


def _section_elastic(tag: int) -> None:
    _, A_cm2, I_cm4 = SECTIONS[tag]
    ops.section("Elastic", tag, E, A_cm2 * 1e-4, I_cm4 * 1e-8)


def _vertical(element: int, q: float, dx: float, dy: float) -> None:
    """Vertical load q (N per m of member, downward positive) on an element going (dx, dy)."""
    L = math.hypot(dx, dy)
    ops.eleLoad("-ele", element, "-type", "-beamUniform", -q * dx / L, -q * dy / L)


def _on_plan(element: int, q_plan: float, dx: float, dy: float) -> None:
    """Vertical load q_plan per m on plan (snow) as a load per m of the sloping member."""
    _vertical(element, q_plan * abs(dx) / math.hypot(dx, dy), dx, dy)


def build_model() -> dict:
    """Build the shed frame in the OpenSees domain; returns a short description."""
    ops.wipe()
    ops.model("basic", "-ndm", 2, "-ndf", 3)
    ops.node(1, 0.0, 0.0)
    ops.node(2, 0.0, EAVES)
    ops.node(20, SPAN, EAVES)
    ops.node(21, SPAN, 0.0)
    # rafter nodes 3 .. 19 from the left eaves over the apex to the right eaves
    pieces = 2 * RAFTER_PIECES
    for k in range(1, pieces):
        x = SPAN * k / pieces
        y = EAVES + (APEX - EAVES) * (1 - abs(2 * x / SPAN - 1))
        ops.node(2 + k, x, y)
    ridge = [2] + [2 + k for k in range(1, pieces)] + [20]
    ops.fix(1, 1, 1, 0)
    ops.fix(21, 1, 1, 0)
    ops.geomTransf("Linear", 1)
    for tag in SECTIONS:
        _section_elastic(tag)
    ops.element("elasticBeamColumn", 1, 1, 2, 1, 1)      # left column
    ops.element("elasticBeamColumn", 2, 21, 20, 1, 1)    # right column
    rafters = []
    for k in range(pieces):
        ops.element("elasticBeamColumn", 10 + k, ridge[k], ridge[k + 1], 2, 1)
        rafters.append((10 + k, ridge[k], ridge[k + 1]))

    def run(node_a: int, node_b: int) -> tuple[float, float]:
        (xa, ya), (xb, yb) = ops.nodeCoord(node_a), ops.nodeCoord(node_b)
        return xb - xa, yb - ya

    ops.timeSeries("Linear", 1)
    ops.pattern("Plain", 1, 1)  # permanent: 0.30 kN/m2 roof build-up + self-weight
    for element, a, b in rafters:
        _vertical(element, 0.30e3 * SPACING + 0.42e3, *run(a, b))
    for element, a, b in ((1, 1, 2), (2, 21, 20)):
        _vertical(element, 0.20e3 * SPACING + 0.66e3, *run(a, b))  # wall rails and cladding
    ops.pattern("Plain", 2, 1)  # snow: shape factor 0.8 x 1.25 kN/m2 on the ground, on plan
    for element, a, b in rafters:
        _on_plan(element, 1.00e3 * SPACING, *run(a, b))
    ops.pattern("Plain", 3, 1)  # imposed on roof, 0.4 kN/m2 on plan
    for element, a, b in rafters:
        _on_plan(element, 0.40e3 * SPACING, *run(a, b))
    for pattern, sign in ((4, 1.0), (5, -1.0)):
        ops.pattern("Plain", pattern, 1)
        windward, leeward = (1, 2) if sign > 0 else (2, 1)
        # walls: pressure 0.65 kN/m2 windward, suction 0.35 kN/m2 leeward, both pushing along
        # +X for wind from the left. Local y of a column going up is -X.
        ops.eleLoad("-ele", windward, "-type", "-beamUniform", -sign * 0.65e3 * SPACING)
        ops.eleLoad("-ele", leeward, "-type", "-beamUniform", -sign * 0.35e3 * SPACING)
        # roof: suction 0.70 kN/m2 normal to the roof (local +y points out of the roof)
        for element, _, _ in rafters:
            ops.eleLoad("-ele", element, "-type", "-beamUniform", 0.70e3 * SPACING)
    return {"name": "Cooperative implement shed", "sections": {t: s[0] for t, s in
                                                               SECTIONS.items()}}


if __name__ == "__main__":
    info = build_model()
    print(info["name"], "nodes:", len(ops.getNodeTags()), "elements:", len(ops.getEleTags()),
          "load patterns:", ops.getPatterns())
