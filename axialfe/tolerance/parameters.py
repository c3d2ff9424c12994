"""The affine map from a file's toleranced inputs to a workflow's named scalar parameters.

A joint or fit study evaluates its closed forms on arrays of named parameters
(:func:`axialfe.joints.joint.joint_parameters`,
:func:`axialfe.fits.fit.fit_parameters`).  Which parameters an input moves is
found as the model study finds it (:mod:`axialfe.tolerance.batch`): the file
is read again with each input moved (``build``), and once with all moved to
check that the map is affine (each parameter is a value of the file, or a
copy of one such as a service temperature that defaults to the assembly's).
No file key is named twice: the reader alone knows where an input goes.
"""

from __future__ import annotations

import numpy as np

from ..errors import ModelError

__all__ = ["ParameterMap"]


class ParameterMap:
    """Named parameters as an affine function of the input values.

    Parameters
    ----------
    params_of : callable
        ``params_of(obj) -> {name: float}`` (NaN where a value is not given).
    build : callable
        ``build({path: SI value})``: the object read again with those inputs moved.
    found : sequence of Toleranced
        The inputs (their paths and lines).
    nominal, steps : ndarray
        The inputs' nominal values and the step each is moved by (non-zero).

    Raises
    ------
    ModelError
        When the file refuses the values of a moved input (located at the input),
        or the parameters are not affine in the inputs (an internal limit: the
        study cannot use the closed forms).
    """

    def __init__(self, params_of, build, found, nominal, steps, source=None):
        paths = [t.path for t in found]
        self.nominal = np.asarray(nominal, dtype=float)

        def at(values, moved):
            try:
                return params_of(build(values))
            except ModelError as exc:   # the file refuses its own values within the box
                t = found[moved[0]]
                names = ", ".join(found[i].path for i in moved)
                raise ModelError(f"{t.path}: within the tolerance{'s' if len(moved) > 1 else ''}"
                                 f" of {names}: {exc.message}; narrow "
                                 f"{'them' if len(moved) > 1 else 'it'}", file=source,
                                 line=t.line) from exc

        base = at(dict(zip(paths, self.nominal.tolist())), [0])
        self.names = list(base)
        self.base = np.array([base[n] for n in self.names], dtype=float)
        self.missing = np.isnan(self.base)
        cols = []
        for j, path in enumerate(paths):
            values = dict(zip(paths, self.nominal.tolist()))
            values[path] = float(self.nominal[j] + steps[j])
            cols.append((self._vector(at(values, [j])) - self.base) / steps[j])
        self.slopes = np.array(cols).reshape(len(paths), len(self.names))
        self.slopes[:, self.missing] = 0.0
        moved = at(dict(zip(paths, (self.nominal + steps).tolist())), list(range(len(paths))))
        predicted = self.base + np.asarray(steps) @ self.slopes
        got = self._vector(moved)
        scale = np.abs(self.base) + np.abs(predicted)
        bad = ~self.missing & ~(np.abs(got - predicted) <= 1e-9 * scale + 1e-300)
        if bad.any():
            raise ModelError(f"the parameter '{self.names[int(np.argmax(bad))]}' is not affine "
                             "in the toleranced inputs; the study cannot use the closed forms")
        self.moved = np.flatnonzero(np.any(self.slopes != 0.0, axis=0))

    def _vector(self, params):
        v = np.array([params[n] for n in self.names], dtype=float)
        if not np.array_equal(np.isnan(v), self.missing):
            raise ModelError("a toleranced input changes which values the file gives; the "
                             "study cannot use the closed forms")
        return v

    def at(self, points) -> dict:
        """The parameters at each row of ``points`` (samples, inputs): arrays where an
        input moves them, the nominal float elsewhere."""
        points = np.asarray(points, dtype=float)
        out = {n: float(v) for n, v in zip(self.names, self.base)}
        shift = points - self.nominal
        for i in self.moved:
            out[self.names[i]] = self.base[i] + shift @ self.slopes[:, i]
        return out
