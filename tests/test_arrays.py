"""Models from arrays: the same answers as the object API, checked inputs, no copies shared."""

import pickle

import numpy as np
import pytest

from axialfe import Gap, Load, Material, Model, ModelError, Section, Segment, Station, Support, solve
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
