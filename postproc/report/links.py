"""Anchors and file names for members, safe in URLs, HTML ids and file systems."""

from __future__ import annotations

import re

__all__ = ["member_slug", "sheet_anchor", "sheet_href"]

_UNSAFE = re.compile(r"[^A-Za-z0-9_-]")


def member_slug(member: str) -> str:
    """A member id with every character outside [A-Za-z0-9_-] written as _hex_ (one-to-one)."""
    return _UNSAFE.sub(lambda m: f"_{ord(m.group()):x}_", str(member))


def sheet_anchor(member: str) -> str:
    """HTML id of a member's calculation sheet."""
    return f"sheet-{member_slug(member)}"


def sheet_href(member: str, *, inline: bool) -> str:
    """Where a link to a member's sheet points: a section of report.html or its own page."""
    if inline:
        return f"#{sheet_anchor(member)}"
    return f"sheets/{member_slug(member)}.html"
