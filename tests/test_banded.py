"""The banded factorisation and the banded active-set contact search against the paths they speed up.

Each new path must give the answer of the existing one (the sparse LU, and the
exact LCP over the dense gaps x gaps matrix), on random models with gaps,
springs, settlements, parallel segments, tapers and stations given out of
order; and where it cannot be used, it must say so and fall back.  The
references are the existing paths of this package, themselves checked against
closed forms in test_properties.py and test_gaps.py.
"""

from unittest import mock

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from test_properties import PROPS, models

from axialfe.engine import factor
from axialfe.engine.assembly import assemble
from axialfe.engine.active_set import CYCLED, active_set
from axialfe.engine.factor import Band, band_of, band_of_run, factorise
from axialfe.engine.system import System, solve
from axialfe.errors import SolveError
from axialfe.model import Gap, Load, Material, Model, Section, Segment, Station, Support
from axialfe.model.parts import GAP_KINDS
from axialfe.model.cases import load_states


def same(a, b, rel=1e-9):
    """Two solutions agree: displacements, forces, reactions and gaps, to ``rel`` of their size.

    The size of the forces includes what the stiffest segment makes of the largest
    displacement: rounding of the solve leaves forces of that order times eps where
    the true force is zero (free thermal growth).  Displacements below an attometre
    count as zero.
    """
    # (1e-18 m: displacements below an attometre are rounding in any real model)
    su = max(np.abs(b.u).max(), np.abs(a.u).max())
    k = b.axial_force.shape[0] and float(np.max(assemble(b.model).stiffness))
    sn = max(np.abs(b.axial_force).max(), np.abs(b.reactions).max(),
             np.abs(b.gap_force).max(initial=0), k * (su + 1e-18 / rel), 1e-300)
    # displacements against their own size and the stretch the forces (gap forces too)
    # give the stiffest segment (where every station is held, rounding of that stretch
    # is what remains)
    sf = max(np.abs(b.axial_force).max(), np.abs(b.reactions).max(),
             np.abs(b.gap_force).max(initial=0)) / k if k else 0.0
    assert np.abs(a.u - b.u).max() <= rel * max(su, sf) + 1e-18, (a.message, b.message)
    assert np.abs(a.axial_force - b.axial_force).max() <= rel * sn
    assert np.abs(a.reactions - b.reactions).max() <= rel * sn
    assert np.abs(a.gap_force - b.gap_force).max(initial=0) <= rel * sn
    # a gap that touches and carries no force is open and closed at once (a degenerate
    # complementarity): there alone may the two searches name its state differently
    differ = a.gap_closed != b.gap_closed
    assert np.all(a.gap_opening[differ] == 0) and np.all(b.gap_opening[differ] == 0)
    assert np.abs(np.r_[a.gap_force[differ], b.gap_force[differ]]).max(initial=0) <= rel * sn
    assert a.status == b.status == "ok"


@st.composite
def gapped(draw):
    """A random model with gaps to ground (and sometimes one between two stations)."""
    m = draw(models())
    names = [s.name for s in m.stations]
    held = {s.at for s in m.supports if s.kind != "spring"}
    free = [n for n in names if n not in held]
    if not free:
        return m
    at = draw(st.lists(st.sampled_from(free), min_size=1, max_size=len(free), unique=True))
    gaps = [Gap(f"c{k}", (name,), draw(st.floats(0.0, 2e-4)), "contact",
                draw(st.sampled_from(["+x", "-x"]))) for k, name in enumerate(at)]
    if draw(st.integers(0, 4)) == 3:
        a, b = draw(st.permutations(names))[:2]
        gaps.append(Gap("between", (a, b), draw(st.floats(0.0, 2e-4))))
    loads = m.loads + tuple(Load(draw(st.sampled_from(names)), draw(st.floats(-2e5, 2e5)))
                            for _ in range(2))
    return Model(m.stations, m.segments, m.supports, loads, gaps=tuple(gaps),
                 gravity=m.gravity)


def outcome(m, method):
    try:
        return solve(m, method=method)["base"]
    except SolveError as exc:
        return str(exc)


@PROPS
@given(models())
def test_banded_equals_sparse_lu(m):
    b = solve(m, method="sparse-lu")["base"]
    same(solve(m, method="banded")["base"], b)                # small: factorised whole
    with mock.patch.object(factor, "_WHOLE", 0):              # LAPACK's banded routines
        same(solve(m, method="banded")["base"], b)


@PROPS
@given(gapped())
def test_active_set_contact_equals_the_exact_search(m):
    agrees_with_the_exact_search(m)


def agrees_with_the_exact_search(m):
    """The banded search (LAPACK's routines, or its fallback) and the exact search over
    the dense gaps x gaps matrix (the sparse LU never takes the banded one) agree."""
    b = outcome(m, "sparse-lu")
    with mock.patch.object(factor, "_WHOLE", 0):
        a = outcome(m, "auto")
    if isinstance(b, str) or isinstance(a, str):
        assert a == b          # the same error, word for word
    else:
        same(a, b)


def chain(n, n_gaps, seed, two_station=False):
    """A stepped chain with settlements, springs, parallel segments and gaps (invented data)."""
    rng = np.random.default_rng(seed)
    x = np.cumsum(np.r_[0.0, rng.uniform(0.05, 0.2, n)])
    order = rng.permutation(n + 1)
    stations = [Station(f"s{i}", float(x[i])) for i in order]
    steel = Material("steel", 200e9, 12e-6)
    secs = [Section("a", "area", (("area", 2e-4),)),
            Section("d", "round", (("diameter", 0.02),))]
    cone = Section("e", "round", (("diameter", 0.03),))
    segs = [Segment(f"e{i}", f"s{i}", f"s{i + 1}", steel, secs[i % 2],
                    end_section=cone if i % 2 and i % 3 == 0 else None,
                    temperature_change=float(rng.uniform(-30, 60))) for i in range(n)]
    segs += [Segment(f"p{i}", f"s{i}", f"s{i + 2}", steel, secs[0]) for i in range(0, n - 2, 7)]
    sups = [Support("s0", "settlement", displacement=1e-4), Support(f"s{n}", "spring", stiffness=1e8)]
    at = rng.choice(np.arange(1, n), size=n_gaps, replace=False)
    gaps = [Gap(f"g{j}", (f"s{i}",), float(rng.uniform(0, 1e-3)), "contact",
                "+x" if j % 2 else "-x") for j, i in enumerate(at)]
    if two_station:
        gaps.append(Gap("joint", ("s3", "s9"), 1e-4))
    loads = [Load(f"s{i}", float(rng.uniform(-5e4, 5e4))) for i in rng.choice(n, 20) + 1]
    return Model(stations, segs, sups, loads, gaps=gaps)


def test_many_gaps_on_a_long_chain_take_the_active_set_and_agree_with_the_exact_search():
    m = chain(400, 80, seed=3)
    system = System(m)
    a = system.solve_state(load_states(m)[0])
    assert system.factor.method == "banded" and system.factor.width == 2
    assert system.last_contact[0] == "active-set"
    assert 0 < int(a.gap_closed.sum()) < 80
    # nor does the certificate build the dense gaps x gaps matrix: gaps on distinct free
    # stations against ground are independent by their layout
    assert system._M is None
    b = solve(m, method="sparse-lu")["base"]
    same(a, b)


def test_a_gap_between_two_stations_takes_the_banded_search_with_multiplier_rows():
    m = chain(60, 10, seed=4, two_station=True)
    system = System(m)
    a = system.solve_state(load_states(m)[0])
    assert system.last_contact[0] == "active-set"
    # its gaps close no loop of stations: independent by their layout, so the certificate
    # builds no block of the dense gaps x gaps matrix
    assert system._M is None
    same(a, solve(m, method="sparse-lu")["base"])


def test_gaps_that_close_a_loop_are_checked_for_dependence_and_refused_alike():
    # two gaps between the same two stations, both closed, act on one motion: the
    # banded search gives way, and both paths refuse with the same located message
    base = chain(30, 0, seed=6)
    gaps = (Gap("j1", ("s3", "s9"), 0.0), Gap("j2", ("s9", "s3"), 0.0, "slack"),
            Gap("j3", ("s3", "s9"), 0.0))
    m = Model(base.stations, base.segments, base.supports,
              base.loads + (Load("s9", -3e5),), gaps=gaps)
    with mock.patch.object(factor, "_WHOLE", 0):
        a = outcome(m, "auto")
    b = outcome(m, "sparse-lu")
    assert isinstance(a, str) and a == b and "not unique" in a


@st.composite
def linked(draw):
    """A random model with gaps between stations (contacts and slack links; one end may
    be held by a support) and to ground, as the multiplier rows of the banded search
    take them."""
    m = draw(models())
    names = [s.name for s in m.stations]
    held = {s.at for s in m.supports if s.kind != "spring"}
    free = [n for n in names if n not in held]
    if len(free) < 2:
        return m
    pairs = draw(st.lists(st.tuples(st.sampled_from(free), st.sampled_from(names))
                          .filter(lambda p: p[0] != p[1]), min_size=1, max_size=3,
                          unique_by=lambda p: frozenset(p)))
    flips = draw(st.lists(st.booleans(), min_size=len(pairs), max_size=len(pairs)))
    pairs = [p[::-1] if flip else p for p, flip in zip(pairs, flips)]   # the held one first too
    gaps = [Gap(f"b{k}", pair, draw(st.floats(0.0, 2e-4)), draw(st.sampled_from(GAP_KINDS)))
            for k, pair in enumerate(pairs)]
    at = draw(st.lists(st.sampled_from(free), max_size=2, unique=True))
    gaps += [Gap(f"c{k}", (name,), draw(st.floats(0.0, 2e-4)), "contact",
                 draw(st.sampled_from(["+x", "-x"]))) for k, name in enumerate(at)]
    loads = m.loads + tuple(Load(draw(st.sampled_from(names)), draw(st.floats(-2e5, 2e5)))
                            for _ in range(2))
    return Model(m.stations, m.segments, m.supports, loads, gaps=tuple(gaps),
                 gravity=m.gravity)


@PROPS
@given(linked())
def test_gaps_between_stations_in_the_band_equal_the_exact_search(m):
    # the multiplier rows in the band against the exact search
    agrees_with_the_exact_search(m)


def test_the_active_set_reports_a_cycle_and_the_system_falls_back():
    m = chain(100, 30, seed=5)
    system = System(m)
    state = load_states(m)[0]
    F, u_presc, _ = system.state_vectors(state)
    o0, _ = system.gap_problem(F, u_presc)
    u = np.zeros(system.asm.n)
    u[system.presc] = u_presc
    b = F[system.free] - system.K_fr @ u[system.restrained]
    if system.band.order is not None:
        b = b[system.band.order]
    at = system._ground_gaps()
    scale = max(np.abs(o0).max(), system.clearance.max())
    # one iteration from the all-open state cannot settle a case where gaps close
    assert (o0 < 0).any()
    lam, closed, status, its = active_set(system.band, at, system.cons.s1, system.clearance, b,
                                          np.zeros(len(at), dtype=bool), scale, max_iter=1)
    assert (lam, closed, status, its) == (None, None, CYCLED, 1)
    full = active_set(system.band, at, system.cons.s1, system.clearance, b,
                      np.zeros(len(at), dtype=bool), scale)
    assert full[2] == "solved" and full[3] > 1


def test_band_of_writes_the_free_free_stiffness():
    rng = np.random.default_rng(7)
    n_st, m = 30, 60
    start = rng.integers(0, n_st, m)
    end = (start + rng.integers(1, 4, m)) % n_st
    k = rng.uniform(1.0, 5.0, m)
    spring = np.where(rng.random(n_st) < 0.2, 3.0, 0.0)
    K = np.diag(spring)
    for a, b, kk in zip(start, end, k):
        K[np.ix_([a, b], [a, b])] += kk * np.array([[1, -1], [-1, 1]])
    free = np.flatnonzero(rng.random(n_st) < 0.8)
    pos = np.full(n_st, -1)
    pos[free] = np.arange(len(free))
    band = band_of(len(free), pos, start, end, k, spring)
    dense = np.zeros((len(free), len(free)))
    for d in range(band.width + 1):
        idx = np.arange(len(free) - d)
        dense[idx + d, idx] = dense[idx, idx + d] = band.ab[d, :len(free) - d]
    for d in range(1, band.width + 1):
        assert not band.ab[d, len(free) - d:].any()      # the band's unused corner
    assert np.abs(dense - K[np.ix_(free, free)]).max() <= 1e-12
    v = rng.standard_normal(len(free))
    assert np.abs(band.matvec(v) - dense @ v).max() <= 1e-12


@PROPS
@given(st.integers(2, 30).flatmap(lambda n: st.tuples(
    st.just(n), st.integers(0, n - 1), st.integers(1, n),
    st.lists(st.floats(0.5, 5.0), min_size=n - 1, max_size=n - 1),
    st.lists(st.sampled_from([0.0, 0.0, 3.0]), min_size=n, max_size=n))))
def test_the_band_of_a_run_of_a_chain_is_band_of(case):
    # a chain numbered along the bar whose unknowns are one run of stations: its band
    # written from slices, against band_of's, to the last bit
    n, first, size, k, spring = case
    stop = min(first + size, n)
    k, spring = np.array(k), np.array(spring)
    pos = np.full(n, -1)
    pos[first:stop] = np.arange(stop - first)
    start = np.arange(n - 1)
    a = band_of_run(first, stop, k, spring)
    b = band_of(stop - first, pos, start, start + 1, k, spring)
    assert a.ab.shape == b.ab.shape
    assert a.ab.tobytes() == b.ab.tobytes()


@pytest.mark.parametrize("n, width", [(3, 1), (40, 1), (40, 2)])  # whole, tridiagonal, general
def test_banded_refuses_a_matrix_that_is_not_positive_definite_and_auto_falls_back(n, width):
    import scipy.sparse as sp

    ab = np.zeros((width + 1, n))
    ab[0], ab[1, :-1] = 2.0, -1.0
    ab[0, 1] = -2.0                  # a negative pivot
    band = Band(ab)
    with pytest.raises(SolveError) as err:
        factorise(None, "banded", "bar.toml", band=band)
    assert str(err.value) == ("bar.toml: the stiffness matrix is not positive definite; check "
                              "for segments of vanishing stiffness, or use method 'sparse-lu'")
    dense = band.dense()
    f = factorise(lambda: sp.csc_matrix(dense), "auto", band=band)
    assert f.method == "sparse-lu"
    assert f.fallback == "the band is not positive definite"
    assert np.abs(dense @ f.solve(np.ones(n)) - 1).max() <= 1e-12


def test_auto_takes_the_sparse_lu_for_a_wide_band(monkeypatch):
    monkeypatch.setattr(factor, "BAND_LIMIT", 0)
    monkeypatch.setattr(factor, "_BAND_WHOLE", 0)
    m = chain(30, 0, seed=1)
    system = System(m)
    assert system.factor.method == "sparse-lu"
    assert system.factor.fallback == "the band is wide (2 > 0)"


def test_a_wide_general_band_solves_blocks():
    m = chain(50, 0, seed=2)
    system = System(m, method="banded")
    rhs = np.random.default_rng(0).standard_normal((len(system.free), 3))
    K_ff = system._K_ff().toarray()
    assert np.abs(K_ff @ system.factor.solve(rhs) - rhs).max() <= 1e-9 * np.abs(rhs).max()


@PROPS
@given(models())
def test_values_made_on_first_read_are_those_of_the_relations(model):
    # a result makes its fields, stresses, strains and parts of the elongation when first
    # read: the same numbers as the relations give from the arrays it checked, read-only
    from axialfe.mechanics import Fields
    from axialfe.results import Deferred

    system = System(model)
    asm = system.asm
    for state in load_states(model):
        case = system.solve_state(state)
        assert isinstance(case.__dict__["fields"], Deferred)
        N = case.axial_force
        expected = {"stress": N / asm.area, "mechanical_strain": N / asm.area / asm.modulus[:, None],
                    "elastic_elongation": case.elongation - (asm.expansion * state.dT * asm.length
                                                             + asm.misfit),
                    "thermal_strain": asm.expansion * state.dT,
                    "thermal_elongation": asm.expansion * state.dT * asm.length,
                    "length": asm.length}
        for key, value in expected.items():
            got = getattr(case, key)
            assert not isinstance(case.__dict__[key], Deferred)   # made once, then kept
            assert np.array_equal(got, value), key
            with pytest.raises(ValueError, match="read-only"):
                got[...] = 0
        fields = case.fields
        direct = Fields.of(N[:, 0], state.q_factor * asm.q * asm.direction, asm.rho_g,
                           *asm.factors.T, asm.length, asm.modulus, end_force=N,
                           x_from=system.x[asm.start], x_to=system.x[asm.end])
        for key in ("force", "area", "end_force", "x_from", "x_to"):
            assert np.array_equal(getattr(fields, key), getattr(direct, key)), key
        assert case.fields is fields
