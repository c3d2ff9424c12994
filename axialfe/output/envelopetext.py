"""Text forms of an envelope: the terminal summary and tables, Markdown and CSV rows.

Everything here reads an :class:`~axialfe.envelope.Envelope` and writes text; it
computes nothing new (the least and largest of each group, which the summary
shows, are picked from the entries' own values).
"""

from __future__ import annotations

from ..envelope import Envelope
from ..formatting import number
from ..units import OutputUnits

__all__ = ["envelope_lines", "envelope_summary_lines", "envelope_markdown", "envelope_csv_rows",
           "envelope_tables"]

def _g(value, digits=6):
    return number(value, digits, plain=False)


def _title(env: Envelope) -> str:
    text = (f"envelope over {len(env.cases)} case" + ("s" if len(env.cases) != 1 else "")
            + " (least and largest, with the case that gives each)")
    if env.excluded:
        text += "; left out as inaccurate: " + ", ".join(f"'{c}'" for c in env.excluded)
    return text


def envelope_tables(env: Envelope, units: OutputUnits):
    """Yield (title, headers, rows) of the full envelope: one table per group."""
    data = env.to_dict(units)
    u = units.as_dict()

    def pair(entry):
        return [_g(entry["min"]), entry["min_case"], _g(entry["max"]), entry["max_case"]]

    if data["stations"]:
        yield ("stations", ["station", f"min displacement [{u['displacement']}]", "case",
                            f"max displacement [{u['displacement']}]", "case"],
               [[e["name"]] + pair(e) for e in data["stations"]])
    segs = data["segments"]
    if segs:
        rows = []
        for force, stress in zip(segs[0::2], segs[1::2]):
            rows.append([force["name"]] + pair(force) + pair(stress))
        yield ("segments (along the whole segment, its inside included)",
               ["segment", f"min N [{u['force']}]", "case", f"max N [{u['force']}]", "case",
                f"min stress [{u['stress']}]", "case", f"max stress [{u['stress']}]", "case"], rows)
    if data["reactions"]:
        yield ("reactions (force of the support on the bar, + toward +x)",
               ["at", "support", f"min [{u['force']}]", "case", f"max [{u['force']}]", "case"],
               [[e["at"], e["kind"]] + pair(e) for e in data["reactions"]])
    gaps = data["gaps"]
    if gaps:
        yield ("gaps (force + in tension)",
               ["gap", "kind", f"min force [{u['force']}]", "case", f"max force [{u['force']}]",
                "case", f"min opening [{u['displacement']}]", "case",
                f"max opening [{u['displacement']}]", "case"],
               [[f["name"], f["kind"]] + pair(f) + pair(o) for f, o in zip(gaps[0::2], gaps[1::2])])


def _summary_rows(env: Envelope, units: OutputUnits):
    """One row per kind of quantity: its least and largest over all items of the group."""
    u = units.as_dict()
    rows = []

    def row(label, entries, where):
        if not entries:
            return
        low = min(entries, key=lambda e: e["min"])      # the first of ties
        high = max(entries, key=lambda e: e["max"])
        rows.append([label, _g(low["min"]), low["min_case"], where(low), _g(high["max"]),
                     high["max_case"], where(high)])

    data = env.to_dict(units)
    row(f"displacement [{u['displacement']}]", data["stations"], lambda e: e["name"])
    row(f"axial force [{u['force']}]", data["segments"][0::2], lambda e: e["name"])
    row(f"stress [{u['stress']}]", data["segments"][1::2], lambda e: e["name"])
    for e in data["reactions"]:
        row(f"reaction [{u['force']}]", [e], lambda e: e["at"])
    for e in data["gaps"][0::2]:
        row(f"gap force [{u['force']}]", [e], lambda e: e["name"])
    return rows


def envelope_summary_lines(env: Envelope, units: OutputUnits, grid) -> list[str]:
    """The short envelope (``grid`` aligns a table): for each kind of quantity its least and
    largest value, the case and the item."""
    if not env.cases:
        return [" " + _title(env)]
    n = len(env.cases)
    out = [f" envelope over {n} case{'s' if n != 1 else ''} (least and largest with their case; "
           "--envelope lists every item)"]
    if env.excluded:
        out.append("   left out as inaccurate: " + ", ".join(f"'{c}'" for c in env.excluded))
    out += grid(["quantity", "min", "case", "at", "max", "case", "at"], _summary_rows(env, units))
    return out


def envelope_lines(env: Envelope, units: OutputUnits, grid) -> list[str]:
    """The full envelope as terminal lines, one table per group."""
    out = ["== " + _title(env) + " =="]
    for title, headers, rows in envelope_tables(env, units):
        out.append(f" {title}")
        out += grid(headers, rows)
        out.append("")
    return out


def envelope_markdown(env: Envelope, units: OutputUnits, escape) -> list[str]:
    """Markdown lines of the full envelope (``escape`` escapes a cell)."""
    out = [f"## {escape(_title(env)).capitalize()}", ""]
    for title, headers, rows in envelope_tables(env, units):
        out += [f"**{escape(title)}**", "", "| " + " | ".join(headers) + " |",
                "|" + "|".join("---" for _ in headers) + "|"]
        out += ["| " + " | ".join(escape(c) for c in r) + " |" for r in rows]
        out.append("")
    return out


def envelope_csv_rows(env: Envelope, units: OutputUnits) -> list[list[str]]:
    """CSV rows of the envelope in the long table's columns (case, item, name, quantity, end,
    value, unit): case ``envelope``, end ``min``, ``max`` (the value) and ``min_case``,
    ``max_case`` (the case that gives it, with no unit)."""
    rows = []
    data = env.to_dict(units)
    for group, item in (("stations", "station"), ("segments", "segment"),
                        ("reactions", "reaction"), ("gaps", "gap")):
        for e in data[group]:
            name = e["at"] if item == "reaction" else e["name"]
            for end in ("min", "max"):
                rows.append(["envelope", item, name, e["quantity"], end, repr(e[end]), e["unit"]])
                rows.append(["envelope", item, name, e["quantity"], f"{end}_case",
                             e[f"{end}_case"], ""])
    return rows
