"""The frame drawn as SVG: an elevation of a plane frame, an axonometric view (plan and elevations
on request) of a space frame; each member shaded by its largest utilisation.

Colour is on the viridis scale; a failing member is also drawn thick and dashed with a text label,
a member not evaluated is drawn dotted and grey with a text label, so nothing depends on colour.
Member names show on hover (SVG title) and, in label mode or printed, beside each member.
"""

from __future__ import annotations

import html

import numpy as np
import pandas as pd

from ..model.frame import Frame
from ..model.members import Members
from ..model.rows import FAIL, NOT_EVALUATED
from .colours import NOT_EVALUATED_COLOUR, VIRIDIS, utilisation_colour
from .links import sheet_href

__all__ = ["HEIGHT", "LINE", "MARGIN", "VIEW_TITLES", "WIDTH", "default_views", "frame_svg",
           "legend_svg", "member_polylines", "projected", "short_label"]

VIEW_TITLES = {"elevation": "elevation", "axonometric": "axonometric view", "plan": "plan",
               "elevation-x": "elevation looking along Y",
               "elevation-y": "elevation looking along X"}
WIDTH, HEIGHT, MARGIN = 960.0, 560.0, 40.0
LINE = {"pass": ("4", ""), FAIL: ("8", "16 6"), NOT_EVALUATED: ("5", "2 6")}


def member_polylines(frame: Frame, members: Members) -> dict[str, np.ndarray]:
    """Global coordinates (k, 3) of the nodes along each design member, start to end."""
    xyz = frame.nodes[["x_m", "y_m", "z_m"]].astype(float).fillna(0.0)
    ends = frame.elements[["node_i", "node_j"]].astype(str)
    links = members.member_elements.sort_values(["member", "position"])
    start = members.members["start_node"].astype(str)
    out: dict[str, np.ndarray] = {}
    for member, elements in links.groupby("member", sort=False)["element"]:
        node = start.get(member)
        chain = [node] if node is not None else []
        for element in elements.astype(str):
            i, j = ends.loc[element]
            if not chain:
                chain = [i]
            chain.append(j if chain[-1] == i else i)
        out[str(member)] = xyz.loc[chain].to_numpy()
    return out


def default_views(frame: Frame, extra: tuple[str, ...] = ()) -> list[str]:
    """The views of a frame: an elevation of a plane frame (or of a space frame lying in one
    vertical plane), else the axonometric view plus any asked for."""
    if frame.ndm == 2:
        return ["elevation"]
    xyz = frame.nodes[["x_m", "y_m"]].astype(float).fillna(0.0).to_numpy()
    spread = np.ptp(xyz, axis=0) if len(xyz) else np.zeros(2)
    if spread[1] < 1e-9:
        return ["elevation-x"]
    if spread[0] < 1e-9:
        return ["elevation-y"]
    return list(dict.fromkeys(["axonometric", *extra]))


def projected(points: np.ndarray, view: str, ndm: int) -> np.ndarray:
    """(k, 2) drawing coordinates (right, up) of global points for a view."""
    x, y, z = points[:, 0], points[:, 1], points[:, 2]
    if view == "elevation":  # plane frames: X right, Y up
        return np.column_stack([x, y]) if ndm == 2 else np.column_stack([x, z])
    if view == "plan":
        return np.column_stack([x, y])
    if view == "elevation-x":
        return np.column_stack([x, z])
    if view == "elevation-y":
        return np.column_stack([y, z])
    # axonometric (isometric, seen from +X +Y above): X and Y run 30 degrees off the horizontal
    c, s = np.cos(np.pi / 6), np.sin(np.pi / 6)
    return np.column_stack([(x - y) * c, z - (x + y) * s])


def frame_svg(polylines: dict[str, np.ndarray], shading: pd.DataFrame, *, view: str, ndm: int,
              caption: str, inline_sheets: bool, svg_id: str) -> str:
    """One view of the frame. `shading`: index member; columns utilisation, status, label."""
    if not polylines:
        return "<p>No members to draw.</p>"
    flat = {m: projected(p, view, ndm) for m, p in polylines.items()}
    every = np.vstack(list(flat.values()))
    low, high = every.min(axis=0), every.max(axis=0)
    span = np.where(high - low > 1e-9, high - low, 1.0)
    scale = min((WIDTH - 2 * MARGIN) / span[0], (HEIGHT - 2 * MARGIN) / span[1])
    size = span * scale
    offset = np.array([(WIDTH - size[0]) / 2, (HEIGHT - size[1]) / 2])

    def to_px(p: np.ndarray) -> np.ndarray:
        return np.column_stack([offset[0] + (p[:, 0] - low[0]) * scale,
                                HEIGHT - offset[1] - (p[:, 1] - low[1]) * scale])

    esc = html.escape
    casings, shapes, labels = [], [], []
    # draw passes first and failures last, so a failing member is never hidden under another
    order = sorted(flat, key=lambda m: {"pass": 0, NOT_EVALUATED: 1, FAIL: 2}.get(
        str(shading["status"].get(m, NOT_EVALUATED)), 1))
    for member in order:
        px = to_px(flat[member])
        points = " ".join(f"{a:.1f},{b:.1f}" for a, b in px)
        u = float(shading["utilisation"].get(member, np.nan))
        status = str(shading["status"].get(member, NOT_EVALUATED))
        label = str(shading["label"].get(member, ""))
        width, dash = LINE.get(status, LINE[NOT_EVALUATED])
        colour = NOT_EVALUATED_COLOUR if status == NOT_EVALUATED else utilisation_colour(u)
        dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
        cls = {"pass": "ok", FAIL: "fail", NOT_EVALUATED: "ne"}.get(status, "ne")
        casings.append(f'<polyline class="casing" points="{points}" '
                       f'stroke-width="{float(width) + 2.5:.1f}"/>')
        shapes.append(
            f'<a href="{esc(sheet_href(member, inline=inline_sheets))}" class="member-link" '
            f'data-member="{esc(member)}"><polyline class="member {cls}" '
            f'data-member="{esc(member)}" points="{points}" stroke="{colour}" '
            f'stroke-width="{width}"{dash_attr}><title>{esc(label)}</title></polyline></a>')
        mid = _midpoint(px)
        marked = status in (FAIL, NOT_EVALUATED)
        text = esc(short_label(member, u, status))
        labels.append(f'<text class="{"mark" if marked else "name"}" x="{mid[0] + 5:.1f}" '
                      f'y="{mid[1] - 5:.1f}">{text}</text>')
    return (f'<figure class="drawing"><svg id="{esc(svg_id)}" class="frame" '
            f'viewBox="0 0 {WIDTH:.0f} {HEIGHT:.0f}" role="img" '
            f'aria-label="{esc(caption)}" xmlns="http://www.w3.org/2000/svg">'
            f'<g class="casings">{"".join(casings)}</g><g class="members">{"".join(shapes)}</g>'
            f'<g class="labels">{"".join(labels)}</g></svg>'
            f'<figcaption>{esc(caption)}</figcaption></figure>')


def short_label(member: str, u: float, status: str) -> str:
    """The label written beside a member: its name, and for a failure or a member not evaluated
    a mark and a word (the hover title has the full text)."""
    if status == FAIL:
        return f"\u2717 {member} {u:.2f} FAIL"
    if status == NOT_EVALUATED:
        return f"? {member} not evaluated"
    return str(member)


def _midpoint(px: np.ndarray) -> np.ndarray:
    """The point halfway along a polyline, where its label goes."""
    if len(px) == 1:
        return px[0]
    seg = np.linalg.norm(np.diff(px, axis=0), axis=1)
    half = seg.sum() / 2
    k = int(np.searchsorted(np.cumsum(seg), half))
    k = min(k, len(seg) - 1)
    before = np.cumsum(seg)[k] - seg[k]
    t = (half - before) / seg[k] if seg[k] > 0 else 0.0
    return px[k] + t * (px[k + 1] - px[k])


def legend_svg() -> str:
    """The colour scale 0 to 1.0 with ticks, and the line styles of failing and not-evaluated
    members."""
    stops = "".join(f'<stop offset="{k / (len(VIRIDIS) - 1):.3f}" '
                    f'stop-color="#{int(r):02x}{int(g):02x}{int(b):02x}"/>'
                    for k, (r, g, b) in enumerate(VIRIDIS))
    ticks = "".join(f'<line x1="{20 + 300 * t:.0f}" y1="34" x2="{20 + 300 * t:.0f}" y2="40" '
                    f'stroke="#000"/><text x="{20 + 300 * t:.0f}" y="54" '
                    f'text-anchor="middle">{t:.2f}</text>' for t in np.linspace(0, 1, 5))
    fail_w, fail_d = LINE[FAIL]
    ne_w, ne_d = LINE[NOT_EVALUATED]
    return (
        '<svg class="legend" viewBox="0 0 760 64" xmlns="http://www.w3.org/2000/svg" role="img" '
        'aria-label="legend: utilisation colour scale and line styles">'
        f'<defs><linearGradient id="viridis-scale">{stops}</linearGradient></defs>'
        '<text x="20" y="12">largest utilisation of the member</text>'
        '<rect x="20" y="18" width="300" height="16" fill="url(#viridis-scale)" stroke="#000"/>'
        f'{ticks}'
        f'<line x1="360" y1="20" x2="430" y2="20" stroke="{utilisation_colour(1.0)}" '
        f'stroke-width="{fail_w}" stroke-dasharray="{fail_d}" class="casing-like"/>'
        '<text x="440" y="25">over the limit: thick dashed, labelled &#10007;</text>'
        f'<line x1="360" y1="46" x2="430" y2="46" stroke="{NOT_EVALUATED_COLOUR}" '
        f'stroke-width="{ne_w}" stroke-dasharray="{ne_d}"/>'
        '<text x="440" y="51">not evaluated: dotted grey, labelled ?</text></svg>')
