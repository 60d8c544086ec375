"""Write an analysed model as the CSV tables of the tables adapter (docs/tables.md).

The tables hold the forces per combination in SI with their units in the headers and full double
precision, so that OpenSees -> CSV -> check gives the same utilisations as OpenSees -> check.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd

from postproc.errors import AnalysisError
from postproc.model.frame import Frame
from postproc.model.results import DISPLACEMENT_COLUMNS, Results

__all__ = ["FLOAT", "FORCE_HEADERS", "export_tables"]

FLOAT = "%.17g"  # round-trips every double exactly
FORCE_HEADERS = {"N_N": "N [N]", "Vy_N": "Vy [N]", "Vz_N": "Vz [N]", "T_Nm": "T [Nm]",
                 "My_Nm": "My [Nm]", "Mz_Nm": "Mz [Nm]"}


def export_tables(frame: Frame, results: Results, directory: Path) -> None:
    """Write nodes, elements, sections, supports, ties, forces, combinations and displacements
    CSV files (ties only where the model has any).

    A failed combination cannot be written (the tables have no status column and a combination
    without forces is refused on reading), so any failed combination raises AnalysisError rather
    than being left out.
    """
    failed = results.combinations.index[results.combinations["status"] != "ok"]
    if len(failed):
        why = results.combinations.loc[failed[0], "message"]
        raise AnalysisError(f"combination {failed[0]!r} failed ({why}); the tables cannot carry "
                            "a failed combination, so nothing was written")
    directory = Path(directory)
    directory.mkdir(parents=True, exist_ok=True)
    coords = ["x", "y", "z"][:frame.ndm]
    nodes = pd.DataFrame({"node": frame.nodes.index.astype(str)})
    for c in coords:
        nodes[f"{c} [m]"] = frame.nodes[f"{c}_m"].to_numpy(float)
    nodes.to_csv(directory / "nodes.csv", index=False, float_format=FLOAT)

    els = frame.elements
    elements = pd.DataFrame({"element": els.index.astype(str), "node_i": els["node_i"],
                             "node_j": els["node_j"], "section": els["section"],
                             "grade": els["grade"], "vz_x": els["vz_x"], "vz_y": els["vz_y"],
                             "vz_z": els["vz_z"], "release_i": els["release_i"].fillna(""),
                             "release_j": els["release_j"].fillna("")})
    elements.to_csv(directory / "elements.csv", index=False, float_format=FLOAT)

    designations = frame.sections.get("designation", pd.Series(frame.sections.index,
                                                               index=frame.sections.index))
    pd.DataFrame({"section": frame.sections.index.astype(str),
                  "designation": designations.to_numpy()}).to_csv(directory / "sections.csv",
                                                                   index=False)

    freedoms = ["ux", "uy", "rz"] if frame.ndm == 2 else ["ux", "uy", "uz", "rx", "ry", "rz"]
    supports = frame.supports[freedoms].astype(int)
    supports.insert(0, "node", frame.supports.index.astype(str))
    supports.to_csv(directory / "supports.csv", index=False)
    if len(frame.ties):
        frame.ties.assign(rigid=frame.ties["rigid"].astype(int)).to_csv(directory / "ties.csv",
                                                                         index=False)

    forces = results.forces.rename(columns={"x_m": "x [m]", **FORCE_HEADERS})
    forces[["combination", "element", "x [m]", *FORCE_HEADERS.values()]].to_csv(
        directory / "forces.csv", index=False, float_format=FLOAT)

    combos = results.combinations
    listing = pd.DataFrame({"combination": combos.index.astype(str), "kind": combos["kind"],
                            "analysis": combos["analysis"],
                            "imperfections": combos["imperfections"].astype(int)})
    if "alpha_cr_given" in combos and combos["alpha_cr_given"].notna().any():
        listing["alpha_cr"] = combos["alpha_cr_given"].to_numpy(float)  # blank where computed
    listing.to_csv(directory / "combinations.csv", index=False)
    if results.displacements is not None and len(results.displacements):
        headers = {c: (f"{c.split('_')[0]} [m]" if c.startswith("u") else c.split("_")[0])
                   for c in DISPLACEMENT_COLUMNS}
        disp = results.displacements.rename(columns=headers)
        disp[["combination", "node", *headers.values()]].to_csv(
            directory / "displacements.csv", index=False, float_format=FLOAT)

