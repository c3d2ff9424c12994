"""Models from arrays: the same answers as the object API, checked inputs, no copies shared."""

import pickle

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from axialfe import Gap, Load, Material, Model, ModelError, Section, Segment, Station, Support, solve
from axialfe.io.modelfile import read_model
from axialfe.model.arrays import ModelArrays
from axialfe.model.parts import PointLoads
from conftest import assert_close


def object_twin(x, start, end, E, A, alpha, dT, fixed, load_at, load_force, fy, rho, g,
                spring_at, spring_k, gap_at, gap_side, gap_c):
    stations = [Station(f"s{i}", float(v)) for i, v in enumerate(x)]
    segments = [Segment(f"e{j}", f"s{a}", f"s{b}",
                        Material(f"e{j}", E[j], alpha[j], fy[j], rho[j]),
                        Section(f"e{j}", "area", (("area", A[j]),)), temperature_change=dT[j])
                for j, (a, b) in enumerate(zip(start, end))]
    supports = ([Support(f"s{i}") for i in fixed]
                + [Support(f"s{i}", "spring", k) for i, k in zip(spring_at, spring_k)])
    gaps = [Gap(f"g{j}", (f"s{i}",), c, side=s) for j, (i, s, c) in enumerate(zip(gap_at, gap_side, gap_c))]
    return Model(stations, segments, supports, [Load(f"s{i}", f) for i, f in zip(load_at, load_force)],
                 gaps, gravity=g)


def test_from_arrays_agrees_with_the_object_api():
    # a chain with a parallel part, a spring, a stop, self-weight and heating
    rng = np.random.default_rng(7)
    x = np.array([0.0, 0.3, 0.7, 1.2, 1.5])
    start, end = np.array([0, 1, 2, 3, 1]), np.array([1, 2, 3, 4, 3])
    m = len(start)
    E, A = rng.uniform(70e9, 210e9, m), rng.uniform(1e-4, 5e-4, m)
    alpha, dT = rng.uniform(10e-6, 23e-6, m), rng.uniform(-20, 60, m)
    fy, rho = rng.uniform(200e6, 400e6, m), rng.uniform(2700, 7850, m)
    args = dict(fixed=[0], load_at=[2, 3], load_force=[5e3, -2e3], yield_strength=fy, density=rho,
                gravity=-9.81, spring_at=[4], spring_stiffness=[2e7], gap_at=[4], gap_side=["+x"],
                gap_clearance=[1e-5])
    arrays = Model.from_arrays(x, start, end, E, A, alpha, dT, **args)
    twin = object_twin(x, start, end, E, A, alpha, dT, [0], [2, 3], [5e3, -2e3], fy, rho, -9.81,
                       [4], [2e7], [4], ["+x"], [1e-5])
    a, b = solve(arrays)["base"], solve(twin)["base"]
    for key in ("u", "axial_force", "stress", "reactions", "gap_force", "gap_opening"):
        assert_close(getattr(a, key), getattr(b, key), rel=1e-12, abs_=1e-12, what=key)
    assert a.to_dict() == b.to_dict()
    assert arrays.segments[2] == twin.segments[2] and arrays.stations[-1] == twin.stations[-1]
    assert_close(pickle.loads(pickle.dumps(arrays)).arrays.x, x, rel=0)


def test_from_arrays_copies_its_inputs():
    x = np.array([0.0, 1.0, 2.0])
    E = np.array([200e9, 200e9])
    model = Model.from_arrays(x, [0, 1], [1, 2], E, 1e-4, fixed=[0], load_at=[2], load_force=[1e3])
    x[2], E[0] = 5.0, 1.0
    assert model.arrays.x[2] == 2.0 and model.arrays.elastic_modulus[0] == 200e9
    with pytest.raises(ValueError):
        model.arrays.x[0] = 1.0


@pytest.mark.parametrize("change, message", [
    (dict(area=[1e-4, -1e-4]), "from_arrays: area[1] must be positive: got -0.0001"),
    (dict(elastic_modulus=np.nan), "from_arrays: elastic_modulus[0] must be positive: got nan"),
    (dict(end=[1, 3]), "from_arrays: end[1] = 3 is not a station index (0 to 2)"),
    (dict(end=[1, 1.5]), "from_arrays: end must be a one-dimensional array of station indices"),
    (dict(x=[0.0, 1.0, 1.0]), "from_arrays: segment 1 joins stations at one position (1 m); "
                              "a segment needs a length"),
    (dict(fixed=[0, 0]), "from_arrays: fixed names a station twice"),
])
def test_from_arrays_refuses_bad_arrays(change, message):
    args = dict(x=[0.0, 1.0, 2.0], start=[0, 1], end=[1, 2], elastic_modulus=200e9, area=1e-4,
                fixed=[0])
    args.update(change)
    with pytest.raises(ModelError) as err:
        Model.from_arrays(**args)
    assert str(err.value) == message


def test_a_model_from_arrays_is_solved_without_an_object_per_segment(monkeypatch):
    # preloads, properties against temperature, assembly, recovery and the certificate all
    # read the array form: no stage makes an object per segment
    from axialfe.model import arrays

    n = 50
    m = Model.from_arrays(np.linspace(0.0, 1.0, n + 1), np.arange(n), np.arange(1, n + 1),
                          200e9, 1e-4, 12e-6, 30.0, fixed=[0, n], load_at=[n // 2],
                          load_force=[1e3])
    expected = solve(m)["base"]

    made, make = [], arrays._Segments.__getitem__

    def counted(self, i):
        made.append(i)
        return make(self, i)

    monkeypatch.setattr(arrays._Segments, "__getitem__", counted)
    case = solve(m)["base"]
    assert len(made) <= 2, made   # a name for a message at most (the certificate's worst place)
    np.testing.assert_array_equal(case.axial_force, expected.axial_force)
    # the reactions of a bar heated between walls with a load at its middle, by hand:
    # -E*A*alpha*dT at each end, and -P/2 from the load
    thermal = 200e9 * 1e-4 * 12e-6 * 30.0
    assert case.reactions[0] == pytest.approx(thermal - 500.0, rel=1e-9)
    assert case.reactions[1] == pytest.approx(-thermal - 500.0, rel=1e-9)


# --- one array form from three routes ------------------------------------------------
# Random models (invented data) with parallel segments, tapers, densities, misfits,
# distributed loads, point loads, springs and stops, built by Model.from_arrays, by the
# object API and by the file reader: all three must give the same ModelArrays, bit for
# bit, and the same supports, loads and gaps.

_pos = st.floats(0.05, 2.0).map(lambda v: round(v, 6))


@st.composite
def _random_models(draw):
    n = draw(st.integers(3, 7))
    x = np.cumsum([0.0] + [draw(_pos) for _ in range(n - 1)])
    pairs = [(i, i + 1) for i in range(n - 1)]
    for _ in range(draw(st.integers(0, 2))):   # parallel parts over a span of stations
        a = draw(st.integers(0, n - 3))
        pairs.append((a, draw(st.integers(a + 2, n - 1))))
    m = len(pairs)
    real = lambda lo, hi: st.integers(0, 10_000).map(  # noqa: E731
        lambda k: float(f"{lo + (hi - lo) * k / 1e4:.6g}"))
    seg = lambda s: np.array([draw(s) for _ in range(m)])  # noqa: E731
    A = seg(real(1e-5, 1e-3))
    taper = seg(st.booleans())
    spec = dict(
        x=x, start=np.array([p[0] for p in pairs]), end=np.array([p[1] for p in pairs]),
        E=seg(real(50e9, 250e9)), A=A, A2=np.where(taper, seg(real(1e-5, 1e-3)), A),
        alpha=seg(real(1e-6, 25e-6)), dT=seg(real(-50.0, 80.0)),
        misfit=seg(real(-1e-4, 1e-4)), q=seg(st.sampled_from([0.0, 150.0, -2500.0])),
        g=draw(st.sampled_from([0.0, -9.81])))
    # self-weight needs a density on every segment (the reader says so); without it, some
    # materials have none
    spec["rho"] = seg(st.sampled_from([2700.0, 7850.0] if spec["g"] else [0.0, 2700.0, 7850.0]))
    spec["load_at"] = np.array(draw(st.lists(st.integers(1, n - 1), max_size=3)), dtype=int)
    spec["load_force"] = np.array([draw(real(-5e4, 5e4)) for _ in spec["load_at"]])
    spec["spring_at"] = np.array(draw(st.lists(st.integers(1, n - 1), max_size=2,
                                               unique=True)), dtype=int)
    spec["spring_k"] = np.array([draw(real(1e6, 1e9)) for _ in spec["spring_at"]])
    spec["gap_at"] = np.array([n - 1] if draw(st.booleans()) else [], dtype=int)
    spec["gap_side"] = ["+x"] * len(spec["gap_at"])
    spec["gap_c"] = np.array([draw(real(0.0, 1e-3)) for _ in spec["gap_at"]])
    return spec


def _by_arrays(s):
    return Model.from_arrays(
        s["x"], s["start"], s["end"], s["E"], s["A"], s["alpha"], s["dT"], fixed=[0],
        load_at=s["load_at"], load_force=s["load_force"], density=s["rho"], gravity=s["g"],
        spring_at=s["spring_at"], spring_stiffness=s["spring_k"], gap_at=s["gap_at"],
        gap_side=s["gap_side"], gap_clearance=s["gap_c"], end_area=s["A2"], misfit=s["misfit"],
        distributed_load=s["q"])


def _by_objects(s):
    stations = [Station(f"s{i}", float(v)) for i, v in enumerate(s["x"])]
    segments = []
    for j, (a, b) in enumerate(zip(s["start"], s["end"])):
        rho = float(s["rho"][j]) or None
        end = (None if s["A2"][j] == s["A"][j] else
               Section(f"e{j}-end", "area", (("area", float(s["A2"][j])),)))
        segments.append(Segment(
            f"e{j}", f"s{a}", f"s{b}",
            Material(f"e{j}", float(s["E"][j]), float(s["alpha"][j]), density=rho),
            Section(f"e{j}", "area", (("area", float(s["A"][j])),)), end,
            temperature_change=float(s["dT"][j]), misfit=float(s["misfit"][j]),
            distributed_load=float(s["q"][j])))
    supports = ([Support("s0")] + [Support(f"s{i}", "spring", float(k))
                                   for i, k in zip(s["spring_at"], s["spring_k"])])
    loads = [Load(f"s{i}", float(f)) for i, f in zip(s["load_at"], s["load_force"])]
    gaps = [Gap(f"g{j}", (f"s{i}",), float(c), side=side)
            for j, (i, side, c) in enumerate(zip(s["gap_at"], s["gap_side"], s["gap_c"]))]
    return Model(stations, segments, supports, loads, gaps, gravity=s["g"])


def _by_file(s, folder):
    out = ['title = "random"', "", "[settings]", f'gravity = "{float(s["g"])!r} m/s^2"', ""]
    for j in range(len(s["start"])):
        out += [f"[materials.e{j}]", f'elastic_modulus = "{float(s["E"][j])!r} Pa"',
                f'thermal_expansion = "{float(s["alpha"][j])!r} 1/K"']
        if s["rho"][j]:
            out.append(f'density = "{float(s["rho"][j])!r} kg/m^3"')
        out += ["", f"[sections.e{j}]", 'shape = "area"', f'area = "{float(s["A"][j])!r} m^2"',
                ""]
        if s["A2"][j] != s["A"][j]:
            out += [f'[sections."e{j}-end"]', 'shape = "area"',
                    f'area = "{float(s["A2"][j])!r} m^2"', ""]
    out += ["[stations]"] + [f's{i} = "{float(v)!r} m"' for i, v in enumerate(s["x"])] + [""]
    for j, (a, b) in enumerate(zip(s["start"], s["end"])):
        out += ["[[segments]]", f'name = "e{j}"', f'from = "s{a}"', f'to = "s{b}"',
                f'material = "e{j}"', f'section = "e{j}"',
                f'temperature_change = "{float(s["dT"][j])!r} K"',
                f'misfit = "{float(s["misfit"][j])!r} m"',
                f'distributed_load = "{float(s["q"][j])!r} N/m"']
        if s["A2"][j] != s["A"][j]:
            out.append(f'end_section = "e{j}-end"')
        out.append("")
    out += ["[[supports]]", 'at = "s0"', ""]
    for i, k in zip(s["spring_at"], s["spring_k"]):
        out += ["[[supports]]", f'at = "s{i}"', 'kind = "spring"',
                f'stiffness = "{float(k)!r} N/m"', ""]
    for i, f in zip(s["load_at"], s["load_force"]):
        out += ["[[loads]]", f'at = "s{i}"', f'force = "{float(f)!r} N"', ""]
    for j, (i, side, c) in enumerate(zip(s["gap_at"], s["gap_side"], s["gap_c"])):
        out += ["[[gaps]]", f'name = "g{j}"', f'at = "s{i}"', f'side = "{side}"',
                f'clearance = "{float(c)!r} m"', ""]
    path = folder / "random.toml"
    path.write_text("\n".join(out), encoding="utf-8")
    return read_model(path)


@given(_random_models())
def test_arrays_objects_and_files_build_the_same_array_form(tmp_path_factory, spec):
    models = (_by_arrays(spec), _by_objects(spec), _by_file(spec, tmp_path_factory.mktemp("m")))
    first = models[0].arrays
    for other in models[1:]:
        for key in ModelArrays.__dataclass_fields__:
            np.testing.assert_array_equal(getattr(other.arrays, key), getattr(first, key),
                                          err_msg=key)
        assert other.supports == models[0].supports and other.gaps == models[0].gaps
        assert tuple(other.loads) == tuple(models[0].loads) and models[0].loads == other.loads
        assert [s.x for s in other.stations] == [s.x for s in models[0].stations]
    # the segments an array model shows on request are those of the object model
    assert tuple(models[0].segments) == tuple(models[1].segments)
    a, b = solve(models[0])["base"], solve(models[1])["base"]
    np.testing.assert_array_equal(a.axial_force, b.axial_force)


def test_an_array_model_keeps_its_point_loads_as_arrays():
    # no Load object is made to build or solve the model; one is made when asked for
    n = 1000
    m = Model.from_arrays(np.linspace(0.0, 1.0, n + 1), np.arange(n), np.arange(1, n + 1),
                          200e9, 1e-4, fixed=[0], load_at=np.arange(1, n + 1),
                          load_force=np.full(n, 10.0))
    assert isinstance(m.loads, PointLoads) and m.all_cases[0].loads is m.loads
    np.testing.assert_array_equal(m.arrays.load_at, np.arange(1, n + 1))
    case = solve(m)["base"]
    # a bar fixed at one end with equal loads at every station: N in segment j is 10*(n - j)
    np.testing.assert_allclose(case.axial_force[:, 0], 10.0 * (n - np.arange(n)), rtol=1e-9)
    assert m.loads[-1] == Load(f"s{n}", 10.0) and len(m.loads[2:5]) == 3
    assert pickle.loads(pickle.dumps(m)).loads == m.loads
