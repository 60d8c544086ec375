"""Unit conversion at the edges. Inside the tool everything is SI: N, m, Pa, N*m.

Adapters convert once, on reading; reports convert once, on writing (kN, kNm, mm, MPa).
"""

from __future__ import annotations

from .errors import InputError

__all__ = ["FORCE", "KINDS", "LENGTH", "MOMENT", "STRESS", "factor"]

LENGTH = {"m": 1.0, "mm": 1e-3, "cm": 1e-2}
FORCE = {"N": 1.0, "kN": 1e3, "MN": 1e6}
MOMENT = {"Nm": 1.0, "N*m": 1.0, "kNm": 1e3, "kN*m": 1e3, "Nmm": 1e-3, "N*mm": 1e-3, "MNm": 1e6}
STRESS = {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "N/mm2": 1e6, "GPa": 1e9}

KINDS = {"length": LENGTH, "force": FORCE, "moment": MOMENT, "stress": STRESS}


def factor(kind: str, unit: str, *, file: str | None = None, field: str | None = None) -> float:
    """Multiplier that turns a value in `unit` into SI for quantity `kind`."""
    table = KINDS[kind]
    try:
        return table[unit.strip()]
    except KeyError:
        raise InputError(f"unknown {kind} unit '{unit}'; use one of {', '.join(table)}",
                         file=file, field=field) from None
