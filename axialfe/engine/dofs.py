"""Degrees of freedom: supports, the connectivity check, free and restrained stations.

Before anything is factorised, the model is checked from its topology alone:
every connected part must be held by a support, a spring or a gap, or the
model is a mechanism (a located :class:`SolveError`).  A part held only
through gaps gets an anchor station whose rigid shift is solved with the gap
forces.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import SolveError
from ..formatting import names as names_text
from ..model import Model

__all__ = ["Dofs", "degrees_of_freedom", "connected_components"]

_SMALL = 2000   # up to this many stations, parts are found without scipy's graph module


def connected_components(n, a, b):
    """The connected parts of the graph of ``n`` stations with edges ``a[i]-b[i]``.

    Returns ``(count, labels)`` with parts labelled in the order of their least
    station, as ``scipy.sparse.csgraph.connected_components`` labels them.  Small
    graphs are joined by a union-find here, which spares loading scipy's graph
    and linear algebra modules when a small model starts.  A graph in which every
    station but the first has an edge to a station of lower index (a chain, or
    parallel parts, numbered along the bar) is one part, by induction on the
    index: that is seen in a few passes over the edges.
    """
    if n and _joined_downward(n, a, b):
        return 1, np.zeros(n, dtype=np.int32)
    if n > _SMALL:
        import scipy.sparse as sp
        from scipy.sparse.csgraph import connected_components as components

        graph = sp.coo_matrix((np.ones(len(a)), (a, b)), shape=(n, n))
        return components(graph, directed=False)
    parent = list(range(n))

    def root(i):
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i

    for i, j in zip(a.tolist(), b.tolist()):
        ri, rj = root(i), root(j)
        if ri != rj:
            parent[max(ri, rj)] = min(ri, rj)
    roots = np.array([root(i) for i in range(n)], dtype=int)
    # the least station of a part is its root (unions keep the smaller root)
    uniq, labels = np.unique(roots, return_inverse=True)
    return len(uniq), labels.reshape(-1)


def _joined_downward(n, a, b) -> bool:
    """True when every station but station 0 has an edge to a station of lower index."""
    if np.any(a == b):
        return False
    lower = np.zeros(n, dtype=bool)
    lower[np.maximum(a, b)] = True
    return bool(lower[1:].all())


def _any_per_part(labels, count, flags):
    """For each of ``count`` parts, whether any of its stations is flagged."""
    if count == 1:
        return np.array([bool(flags.any())])
    return np.bincount(labels, flags, minlength=count) > 0


@dataclass(frozen=True)
class Dofs:
    """Supports and unknowns of a model (arrays of station or support indices).

    Attributes
    ----------
    presc_support, presc : supports with a prescribed displacement and their stations
    spring_support, spring_at, spring_k : spring supports, their stations and stiffnesses
    part_label : per station, the gap-held part it belongs to (-1: none)
    n_parts, anchors : the gap-held parts and their anchor stations
    free, restrained : stations solved for, and stations prescribed or anchored
    E : scipy.sparse matrix (n, n_parts), the rigid shift of each gap-held part
    """

    presc_support: np.ndarray
    presc: np.ndarray
    spring_support: np.ndarray
    spring_at: np.ndarray
    spring_k: np.ndarray
    part_label: np.ndarray
    n_parts: int
    anchors: np.ndarray
    free: np.ndarray
    restrained: np.ndarray
    E: object


def degrees_of_freedom(model: Model, start, end, cons) -> Dofs:
    """Check connectivity and number the unknowns.

    Parameters
    ----------
    model : Model
    start, end : ndarray of int
        The segments' end stations.
    cons : Unilateral
        The gaps (they connect parts, and hold a part against ground).

    Raises
    ------
    SolveError
        When some stations are held by no support, spring or gap (a mechanism).
    """
    import scipy.sparse as sp

    n = len(model.stations)
    index = model._station_index
    sup = model.supports
    presc_support = np.array([j for j, s in enumerate(sup) if s.kind != "spring"], dtype=int)
    presc = np.array([index[sup[j].at] for j in presc_support], dtype=int)
    spring_support = np.array([j for j, s in enumerate(sup) if s.kind == "spring"], dtype=int)
    spring_at = np.array([index[sup[j].at] for j in spring_support], dtype=int)
    spring_k = np.array([sup[j].stiffness for j in spring_support], dtype=float)

    held = np.zeros(n, dtype=bool)
    held[presc] = True
    held[spring_at] = True
    n_seg, seg_label = connected_components(n, start, end)
    two = cons.b >= 0
    if two.any():
        n_all, all_label = connected_components(n, np.concatenate([start, cons.a[two]]),
                                                np.concatenate([end, cons.b[two]]))
    else:  # no gap joins two stations: the parts are the segments' own
        n_all, all_label = n_seg, seg_label
    grounded = held.copy()
    grounded[cons.a[~two]] = True
    comp_grounded = _any_per_part(all_label, n_all, grounded)
    for c in np.flatnonzero(~comp_grounded):
        used = np.zeros(n, dtype=bool)
        used[start] = used[end] = True
        used[cons.a] = True
        used[cons.b[two]] = True
        names = [st.name for st in model.stations]
        members = [names[i] for i in np.flatnonzero(all_label == c)]
        line = model.line_of(f"stations.{members[0]}")
        if len(members) == 1 and not used[all_label == c].any():
            raise SolveError(f"station '{members[0]}' is not connected to any "
                             "segment or gap and has no support; remove it or connect it",
                             file=model.source, line=line)
        raise SolveError(f"stations {names_text(members)} float: no support, spring or "
                         "gap holds them (a rigid-body mechanism); add a support or connect "
                         "them", file=model.source, line=line)
    comp_held = _any_per_part(seg_label, n_seg, held)
    free_comps = np.flatnonzero(~comp_held)
    # A part held only through gaps: its first station is an anchor, and its
    # rigid shift is solved with the gap forces.
    part_label = np.full(n, -1)
    anchors = []
    for p, c in enumerate(free_comps):
        members = np.flatnonzero(seg_label == c)
        part_label[members] = p
        anchors.append(members[0])
    anchors = np.array(anchors, dtype=int)
    restrained = np.zeros(n, dtype=bool)
    restrained[presc] = True
    restrained[anchors] = True
    if len(free_comps):
        in_part = np.flatnonzero(part_label >= 0)
        E = sp.csr_matrix((np.ones(len(in_part)), (in_part, part_label[in_part])),
                          shape=(n, len(free_comps)))
    else:
        E = sp.csr_matrix((n, 0))
    return Dofs(presc_support, presc, spring_support, spring_at, spring_k, part_label,
                len(free_comps), anchors, np.flatnonzero(~restrained), np.flatnonzero(restrained), E)
