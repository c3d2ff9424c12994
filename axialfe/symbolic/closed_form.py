"""Closed forms: the model's own system assembled and solved exactly with sympy.

For auditing a hand calculation: the same two-node bar elements as
:mod:`axialfe.assemble` (``N_from = k*(du - delta0) + k*G``, node forces from
element equilibrium), built with exact rationals and the declared symbols,
assembled into the same global system, and solved exactly.  Unknowns are the
displacements of the stations without a prescribed value and the forces of the
closed gaps; the reduced system is solved by sparse elimination over the field
of rational functions of the symbols (:func:`sympy.linsolve`), never by an
inverse of the full matrix, and each result is simplified on its own.

Gaps: the closed forms belong to one contact state (the numeric solver's, or
one the user assumes); that state holds where its conditions hold: every
closed contact carries compression (a taut link tension), every open gap has
clearance left.  Symbols are real; a symbol standing alone (times a positive
number) in a field that must be positive (modulus, expansion, size, area,
density, stiffness, clearance, a distance between consecutive stations) is
assumed positive, unless its value says otherwise.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from fractions import Fraction

import sympy

from ..errors import ModelError, SolveError, suggest
from ..mechanics import backends, sections
from ..mechanics.element import element_terms, end_forces, load_terms, nodal_loads
from ..model import Model
from ..model.cases import loading

__all__ = ["ClosedForm", "solve_symbolic", "numeric_model", "closed_form_dict",
           "closed_form_text", "QUANTITIES", "TOLERANCE"]

QUANTITIES = ("reactions", "displacements", "axial_forces", "stresses", "gaps", "conditions")
TOLERANCE = 1e-9


def _rat(value):
    if isinstance(value, Fraction):
        return sympy.Rational(value.numerator, value.denominator)
    if isinstance(value, bool):
        raise TypeError(value)
    if isinstance(value, int):
        return sympy.Integer(value)
    if isinstance(value, float):
        f = Fraction(repr(value))
        return sympy.Rational(f.numerator, f.denominator)
    return value


@dataclass(frozen=True, repr=False)
class ClosedForm:
    """The closed-form solution of one case of a model.

    Attributes
    ----------
    model : Model
    case : str
    symbols : dict of str to sympy.Symbol
        Every declared symbol, with the assumptions used.
    values : dict of str to sympy.Rational or None
        Each symbol's value in SI base units, None when it has none.
    displacements, reactions : dict of str to sympy.Expr
        By station name (reactions summed per station, as
        :meth:`axialfe.results.CaseResult.reaction` does).
    axial_forces, stresses : dict of str to (sympy.Expr, sympy.Expr)
        By segment name, at the ``from`` and the ``to`` end.
    gap_forces : dict of str to sympy.Expr
        Force of each gap (tension positive); 0 for an open one.
    gap_closed : dict of str to bool
        The contact state the closed forms belong to.
    assumed : tuple of str
        The gaps whose state was assumed by the caller.
    conditions : tuple of sympy relations
        Where the contact state holds; all must hold together.
    notes : tuple of str
    """

    model: Model
    case: str
    symbols: dict
    values: dict
    displacements: dict
    reactions: dict
    axial_forces: dict
    stresses: dict
    gap_forces: dict
    gap_closed: dict
    assumed: tuple = ()
    conditions: tuple = ()
    notes: tuple = field(default=())

    def _subs(self):
        return {self.symbols[n]: v for n, v in self.values.items() if v is not None}

    def evaluate(self, expr):
        """The value of ``expr`` (SI) with the symbols' values; None if one is missing."""
        expr = _rat(expr)
        value = expr.xreplace(self._subs())
        if value.free_symbols:
            return None
        return float(value)

    def displacement(self, station: str):
        self.model.station_index(station)
        return self.displacements[station]

    def force(self, segment: str):
        self.model.segment_index(segment)
        return self.axial_forces[segment]

    def reaction(self, station: str):
        if station not in self.reactions:
            raise ModelError(f"station '{station}' has no support", place="reactions",
                             hint=suggest(station, self.reactions))
        return self.reactions[station]

    def gap(self, name: str):
        if name not in self.gap_forces:
            raise ModelError(f"unknown gap '{name}'", place="gaps", hint=suggest(name, self.gap_forces))
        return self.gap_forces[name]

    def __repr__(self):
        return (f"<ClosedForm of '{self.model.title}', case '{self.case}': "
                f"{len(self.displacements)} stations, {len(self.axial_forces)} segments>")

    def _repr_latex_(self) -> str:
        """Every closed form as one LaTeX ``aligned`` block (shown by Jupyter): reactions,
        displacements, forces and stresses at the ``from`` end, gap forces."""
        import sympy

        def name(text):
            return r"\text{" + _latex_text(text) + "}"

        lines = []
        for key, expr in self.reactions.items():
            lines.append(f"R_{{{name(key)}}} &= {sympy.latex(expr)}")
        for key, expr in self.displacements.items():
            lines.append(f"u_{{{name(key)}}} &= {sympy.latex(expr)}")
        for key, (expr, _) in self.axial_forces.items():
            lines.append(f"N_{{{name(key)}}} &= {sympy.latex(expr)}")
        for key, (expr, _) in self.stresses.items():
            lines.append(f"\\sigma_{{{name(key)}}} &= {sympy.latex(expr)}")
        for key, expr in self.gap_forces.items():
            lines.append(f"F_{{{name(key)}}} &= {sympy.latex(expr)}")
        return "$$\\begin{aligned}" + " \\\\ ".join(lines) + "\\end{aligned}$$"


_LATEX_SPECIAL = {"\\": r"\textbackslash{}", "{": r"\{", "}": r"\}", "$": r"\$", "&": r"\&",
                  "#": r"\#", "%": r"\%", "_": r"\_", "^": r"\^{}", "~": r"\~{}"}


def _latex_text(text: str) -> str:
    """Model text made safe inside ``\\text{...}``: LaTeX's special characters escaped."""
    return "".join(_LATEX_SPECIAL.get(ch, ch) for ch in str(text))


# --- the symbols and their assumptions ----------------------------------------
def _positive_fields(model: Model):
    """Yield every value whose field must be positive."""
    seen = set()
    for seg in model.segments:
        mat = seg.material
        if id(mat) not in seen:
            seen.add(id(mat))
            yield from (mat.elastic_modulus, mat.thermal_expansion, mat.density, mat.yield_strength)
        for sec in seg.sections:
            if id(sec) not in seen:
                seen.add(id(sec))
                for key, v in sec.dimensions:
                    if key != "inner_diameter":
                        yield v
    for sup in model.supports:
        if sup.kind == "spring":
            yield sup.stiffness
    for gap in model.gaps:
        yield gap.clearance
    xs = [st.x for st in model.stations]
    if any(isinstance(x, sympy.Basic) and x.free_symbols for x in xs):
        for a, b in zip(xs, xs[1:]):
            yield _rat(b) - _rat(a)


def _symbols(model: Model):
    """Return (names -> real symbols of the model, names -> assumed symbols, values)."""
    values = {d.name: (_rat(d.value) if d.value is not None else None) for d in model.symbols}
    real = {d.name: sympy.Symbol(d.name, real=True) for d in model.symbols}
    positive = set()
    for v in _positive_fields(model):
        if isinstance(v, sympy.Basic):
            coeff, rest = v.as_coeff_Mul()
            if coeff > 0 and rest.is_Symbol and rest.name in real:
                positive.add(rest.name)
    assumed = {}
    for name in real:
        value = values[name]
        if name in positive and (value is None or value > 0):
            assumed[name] = sympy.Symbol(name, positive=True)
        else:
            assumed[name] = real[name]
    return real, assumed, values


# --- assembly ------------------------------------------------------------------
def _element(seg, length, g_local, exact):
    """The element terms of one segment, exactly, from :mod:`axialfe.mechanics`."""
    bk = backends.exact()
    E = exact(seg.material.elastic_modulus)
    rho = exact(seg.material.density) if seg.material.density is not None else sympy.Integer(0)
    (c, p1, q1), (_, p2, q2) = (sections.factors(s.shape, {k: exact(v) for k, v in s.dimensions},
                                                 sympy.pi) for s in seg.sections)
    c = sympy.Integer(c) if isinstance(c, int) else c   # 1 for a rectangle or plain area
    return element_terms(c, p1, q1, p2, q2, length, E, rho * g_local, bk)


def _state(model: Model, case: str | None, exact):
    """Return (name, forces by station, dT by segment, settlement by support), exactly,
    by the one rule of cases and combinations (:func:`axialfe.model.cases.loading`)."""
    cases = {c.name: c for c in model.all_cases}
    combos = {c.name: c for c in model.combinations}
    name = case if case is not None else model.all_cases[0].name
    if name not in cases and name not in combos:
        options = [*cases, *combos]
        raise ModelError(f"unknown case '{name}'", place="cases", hint=suggest(name, options),
                         options=options)
    forces, dT, settle = loading(model, name, exact)
    return name, list(forces), list(dT), list(settle)


def _hide_logs(expr, hidden):
    """Replace each logarithm in ``expr`` by a real dummy (kept in ``hidden``, log -> dummy)."""
    expr = _rat(expr)
    if not isinstance(expr, sympy.Basic):
        return expr
    for atom in expr.atoms(sympy.log):
        if atom not in hidden:
            hidden[atom] = sympy.Dummy(f"log{len(hidden)}", real=True)
    return expr.xreplace(hidden)


def _tidy(expr, drivers=()):
    """Simplify one result: cancel to one fraction, then factor when that is shorter.

    A sum left in the result is grouped by the ``drivers`` (the symbols of the
    loads, temperature changes, misfits, settlements and clearances), each
    coefficient factored, when that reads shorter: ``dT*(L_1*alpha_1 +
    L_2*alpha_2) - c`` rather than ``L_1*alpha_1*dT + L_2*alpha_2*dT - c``.
    """
    expr = _rat(expr)
    if expr.is_number:
        return sympy.cancel(expr)
    e = sympy.cancel(expr)
    f = sympy.factor(e)
    best = f if sympy.count_ops(f) <= sympy.count_ops(e) else e
    if drivers:
        best = best.replace(lambda x: x.is_Add, lambda x: _grouped(x, drivers))
    return _fewer_minus(best)


def _grouped(add, drivers):
    """``add`` grouped by the drivers it holds, when that is shorter."""
    held = [d for d in drivers if add.has(d)]
    if not held:
        return add
    parts = sympy.collect(add, held, evaluate=False)
    if len(parts) < 2:
        return add
    terms = []
    for k, v in parts.items():
        v = sympy.factor(v)
        if v.is_Add and str(-v).count("-") < str(v).count("-"):
            terms.append(-sympy.Mul(k, -v, evaluate=False))
        else:
            terms.append(_fewer_minus(v) * k)
    grouped = sympy.Add(*terms)
    return grouped if len(str(grouped)) < len(str(add)) else add


def _fewer_minus(expr):
    """Take the minus out of brackets that read better negated: -x*(-a - b + c) -> x*(a + b - c)."""
    if not expr.is_Mul:
        return expr
    parts, sign = [], 1
    for f in sympy.Mul.make_args(expr):
        base, exp = f.as_base_exp()
        if base.is_Add and exp.is_Integer:
            neg = sympy.Add(*[-t for t in base.args])
            if str(neg).count("-") <= str(base).count("-"):
                parts.append(sympy.Pow(neg, exp))
                sign *= (-1) ** int(exp)
                continue
        parts.append(f)
    flipped = sympy.Mul(*parts) * sign
    return flipped if str(flipped).count("-") < str(expr).count("-") else expr


def _relation(g, prefer):
    """Return the condition g >= 0 as a readable relation (solved for a symbol when linear)."""
    g = sympy.factor(sympy.cancel(g))
    if g.is_number:
        return sympy.true if g >= 0 else sympy.false
    num, den = sympy.fraction(g)
    sign = 1
    kept = []
    for part in (num, den):
        rest = []
        for f in sympy.Mul.make_args(part):
            if f.is_positive:
                continue
            if f.is_negative:
                sign = -sign
                continue
            rest.append(f)
        kept.append(sympy.Mul(*rest))
    num, den = kept
    if den != 1:
        return sympy.Ge(_tidy(sign * num / den), 0)
    for x in prefer:
        if x not in num.free_symbols:
            continue
        poly = sympy.Poly(num, x)
        if poly.degree() != 1:
            continue
        a, b = poly.all_coeffs()
        a = sympy.factor(a)
        if (sign * a).is_positive:
            return sympy.Ge(x, _tidy(-b / a))
        if (sign * a).is_negative:
            return sympy.Le(x, _tidy(-b / a))
    return sympy.Ge(sign * num, 0)


def used_symbols(model: Model) -> set:
    """The names of the symbols that the values of ``model`` use."""
    used, stack = set(), [model]
    while stack:
        obj = stack.pop()
        if isinstance(obj, sympy.Basic):
            used |= {s.name for s in obj.free_symbols}
        elif dataclasses.is_dataclass(obj) and not isinstance(obj, type):
            stack.extend(getattr(obj, f.name) for f in dataclasses.fields(obj)
                         if f.name not in ("symbols", "lines"))
        elif isinstance(obj, tuple):
            stack.extend(obj)
    return used


def _contact_state(model, case, assume, state):
    """Gap name -> closed: assumed, else given, else the numeric solver's when it can run."""
    gap_names = [g.name for g in model.gaps]
    for name in assume:
        if name not in gap_names:
            raise ModelError(f"--assume names an unknown gap '{name}'", hint=suggest(name, gap_names),
                             options=gap_names or None)
    closed = {}
    for name in gap_names:
        if name in assume:
            closed[name] = bool(assume[name])
        elif state is not None and name in state:
            closed[name] = bool(state[name])
    undecided = [n for n in gap_names if n not in closed]
    if not undecided:
        return closed
    values = {d.name: d.value for d in model.symbols}
    missing = [n for n in values if n in used_symbols(model) and values[n] is None]
    if missing:
        raise ModelError("the contact state is undecided while symbol(s) "
                         + ", ".join(f"'{n}'" for n in missing) + " have no value: assume the "
                         "state of gap(s) " + ", ".join(f"'{n}'" for n in undecided)
                         + f" (e.g. --assume {undecided[0]}=closed)", file=model.source,
                         line=model.line_of(f"gaps.{undecided[0]}"))
    from ..engine.system import solve

    found = solve(numeric_model(model))[case]
    for j, g in enumerate(model.gaps):
        closed.setdefault(g.name, bool(found.gap_closed[j]))
    return {n: closed[n] for n in gap_names}


def _check_positions(model, xs, subs):
    """Symbolic positions: the stations must be listed in increasing x."""
    if not any(isinstance(x, sympy.Basic) and x.free_symbols for x in xs):
        return False
    names = [st.name for st in model.stations]
    for i in range(len(xs) - 1):
        d = (xs[i + 1] - xs[i]).xreplace(subs)
        if (not d.free_symbols and d <= 0) or d.is_nonpositive:
            raise ModelError(f"stations with symbolic positions must be listed in increasing x: "
                             f"'{names[i + 1]}' (x = {xs[i + 1]}) does not lie beyond "
                             f"'{names[i]}' (x = {xs[i]})", file=model.source,
                             line=model.line_of(f"stations.{names[i + 1]}"))
    return True


def solve_symbolic(model: Model, case: str | None = None, assume=None, state=None) -> ClosedForm:
    """Solve one case of a model exactly, in closed form.

    Parameters
    ----------
    model : Model
        A model read with ``symbolic=True`` (values are sympy expressions of
        its symbols), or a plain numeric model (floats are read as the exact
        decimals they print as).
    case : str, optional
        The case or combination (default: the first case).
    assume : mapping of str to bool, optional
        Gap name -> closed (True) or open (False): the contact state to give
        the closed forms for.
    state : mapping of str to bool, optional
        The contact state of the gaps not assumed; by default the numeric
        solver's, when every symbol that the model uses has a value.

    Returns
    -------
    ClosedForm

    Raises
    ------
    ModelError
        When the state of a gap is neither assumed nor given and symbols
        without a value keep the numeric solver from deciding it; when
        symbolic station positions are not in increasing x.
    SolveError
        When the assumed state leaves a part free to move, or has no solution.

    Examples
    --------
    A bar between rigid walls with a load P at a, b short of the right wall,
    takes -P*b/L at the left wall (Timoshenko, Strength of Materials, Part I,
    statically indeterminate problems in tension; from memory):

    >>> from axialfe import parse_model
    >>> text = '''
    ... [symbols]
    ... P = { unit = "kN" }
    ... a = { unit = "mm" }
    ... b = { unit = "mm" }
    ... [materials.steel]
    ... elastic_modulus = "200 GPa"
    ... [sections.rod]
    ... shape = "area"
    ... area = "100 mm^2"
    ... [stations]
    ... left = "0 mm"
    ... C = "a"
    ... right = "a + b"
    ... [[segments]]
    ... from = "left"
    ... to = "C"
    ... material = "steel"
    ... section = "rod"
    ... [[segments]]
    ... from = "C"
    ... to = "right"
    ... material = "steel"
    ... section = "rod"
    ... [[supports]]
    ... at = "left"
    ... [[supports]]
    ... at = "right"
    ... [[loads]]
    ... at = "C"
    ... force = "P"
    ... '''
    >>> cf = solve_symbolic(parse_model(text, symbolic=True))
    >>> cf.reaction("left")
    -P*b/(a + b)
    """
    if any(seg.preload is not None for seg in model.segments):  # axialfe.engine.preload
        raise ModelError("the closed form takes a 'misfit', not a preload", place="segments")
    from ..model.temperature import refuse_tables

    refuse_tables(model, "the closed form", "a property interpolated from a table is not a "
                  "closed form; give the values at the case's temperature as constants")
    real, syms, values = _symbols(model)
    repl = {real[n]: syms[n] for n in real}
    subs = {syms[n]: v for n, v in values.items() if v is not None}

    def exact(v):
        v = _rat(v)
        return v.xreplace(repl) if isinstance(v, sympy.Basic) else v

    xs = [exact(st.x) for st in model.stations]
    by_order = _check_positions(model, xs, subs)
    name, forces, dT, settle = _state(model, case, exact)
    assume = dict(assume or {})
    closed = _contact_state(model, name, assume, state)
    index = {st.name: i for i, st in enumerate(model.stations)}
    n = len(xs)
    gravity = exact(model.gravity)
    causes = [*forces, *dT, *settle, gravity]
    causes += [exact(v) for s in model.segments for v in (s.misfit, s.distributed_load)]
    causes += [exact(g.clearance) for g in model.gaps]
    driving = set().union(*(v.free_symbols for v in causes if isinstance(v, sympy.Basic)))
    drivers = [s for s in syms.values() if s in driving]

    K = {}
    hidden = {}

    def add(i, j, v):
        K[(i, j)] = K.get((i, j), 0) + v

    F = [sympy.Integer(0) + f for f in forces]
    elems = []
    for m, seg in enumerate(model.segments):
        i, j = index[seg.start], index[seg.end]
        dx = xs[j] - xs[i]
        if dx == 0:
            raise ModelError(f"stations '{seg.start}' and '{seg.end}' stand at the same position; "
                             "a segment needs a length", place=f"segments[{m + 1}] ('{seg.name}')",
                             file=model.source, line=model.line_of(f"stations.{seg.start}"))
        if dx.is_number:
            e = 1 if dx > 0 else -1
        elif by_order:
            e = 1 if j > i else -1
        else:  # pragma: no cover - positions are symbolic only with by_order
            raise AssertionError
        L = sympy.expand(e * dx)
        terms = _element(seg, L, gravity * e, exact)
        q_local = exact(seg.distributed_load) * e
        delta0, G, W = load_terms(terms, q_local, dT[m], exact(seg.material.thermal_expansion), L,
                                  exact(seg.misfit))
        # a tapered segment's logarithms stand as single unknowns through the solution,
        # so that no expansion splits log(A_1/A_2) into log(A_1) - log(A_2)
        k, G, W = (_hide_logs(v, hidden) for v in (terms.stiffness, G, W))
        terms = dataclasses.replace(terms, stiffness=k)
        add(i, i, k), add(j, j, k), add(i, j, -k), add(j, i, -k)
        f_from, f_to = nodal_loads(terms, delta0, G, W)
        F[i] += e * f_from
        F[j] += e * f_to
        elems.append((i, j, e, terms, delta0, G, W))

    presc = {}
    springs = []
    for s, sup in enumerate(model.supports):
        at = index[sup.at]
        if sup.kind == "spring":
            springs.append((s, at, exact(sup.stiffness)))
            add(at, at, exact(sup.stiffness))
        else:
            presc[at] = settle[s]

    u = [sympy.Dummy(f"u{i}") for i in range(n)]
    gaps = []
    for g in model.gaps:
        s1, s2 = g.sign
        a = index[g.stations[0]]
        b = index[g.stations[1]] if len(g.stations) == 2 else None
        gaps.append((g, a, b, int(s1), int(s2), exact(g.clearance)))
    lam = {g.name: sympy.Dummy(f"lam_{j}") for j, (g, *_r) in enumerate(gaps) if closed[g.name]}

    def measure(a, b, s1, s2, disp):
        return s1 * disp[a] + (s2 * disp[b] if b is not None else 0)

    known = {u[i]: v for i, v in presc.items()}
    eqs = []
    unknowns = [u[i] for i in range(n) if i not in presc]
    rows = {i: [] for i in range(n)}
    for (i, j), v in K.items():
        rows[i].append((j, v))
    bt = {i: 0 for i in range(n)}
    for g, a, b, s1, s2, c in gaps:
        if g.name in lam:
            bt[a] += s1 * lam[g.name]
            if b is not None:
                bt[b] += s2 * lam[g.name]
            eqs.append(measure(a, b, s1, s2, u) - c)
    for i in range(n):
        if i in presc:
            continue
        eqs.append(sympy.Add(*[v * u[j] for j, v in rows[i]]) + bt[i] - F[i])
    eqs = [sympy.expand(eq.xreplace(known)) if isinstance(eq, sympy.Basic) else eq for eq in eqs]
    unknowns += list(lam.values())
    solution = sympy.linsolve(eqs, unknowns) if unknowns else sympy.FiniteSet(())
    stations = [st.name for st in model.stations]
    in_state = f" in the contact state {_state_text(closed)}" if closed else ""
    consistent = solution != sympy.S.EmptySet
    if not consistent:  # find what moves freely: the solution without loads
        zero = {x: 0 for x in unknowns}
        solution = sympy.linsolve([sympy.expand(eq - eq.xreplace(zero)) for eq in eqs], unknowns)
    (values_u,) = tuple(solution)
    sol = dict(zip(unknowns, values_u))
    free = set(unknowns)
    loose = [stations[i] for i in range(n) if i not in presc and sol[u[i]].free_symbols & free]
    shared = [g for g, v in lam.items() if sol[v].free_symbols & free]
    if loose:
        raise SolveError("stations " + ", ".join(f"'{s}'" for s in loose) + f" float{in_state}: "
                         "no support, spring or closed gap holds them", file=model.source,
                         line=model.line_of(f"stations.{loose[0]}"))
    if not consistent:
        first = next((g for g, c in closed.items() if c), None)
        raise SolveError(f"no equilibrium{in_state}: the closed gaps cannot all close at once",
                         file=model.source, line=model.line_of(f"gaps.{first}") if first else None)
    if shared:
        raise SolveError("the closed gaps " + ", ".join(f"'{g}'" for g in shared) + " share their "
                         f"force in no unique way{in_state}: assume one of them open",
                         file=model.source, line=model.line_of(f"gaps.{shared[0]}"))
    disp = [known.get(u[i], sol.get(u[i])) for i in range(n)]
    disp = [sympy.Integer(0) if d == 0 else d for d in disp]
    lam_v = {g: sol[v] for g, v in lam.items()}

    back = {d: v for v, d in hidden.items()}

    def tidy(expr):
        return _tidy(expr, drivers).xreplace(back)

    # recovery, by the same element formulas as the numeric engine
    axial, stress = {}, {}
    for seg, (i, j, e, terms, delta0, G, W) in zip(model.segments, elems):
        n_from, n_to = end_forces(terms, e * (disp[j] - disp[i]), delta0, G, W)
        axial[seg.name] = (tidy(n_from), tidy(n_to))
        stress[seg.name] = (tidy(n_from / terms.area_from), tidy(n_to / terms.area_to))
    R = [sympy.Add(*[v * disp[j] for j, v in rows[i]]) - F[i] for i in range(n)]
    for g, a, b, s1, s2, c in gaps:
        if g.name in lam:
            R[a] += s1 * lam_v[g.name]
            if b is not None:
                R[b] += s2 * lam_v[g.name]
    reactions = {}
    for s, sup in enumerate(model.supports):
        at = index[sup.at]
        if sup.kind == "spring":
            r = -exact(sup.stiffness) * disp[at]
        else:
            r = R[at] - sum((-kk * disp[at] for _, a_, kk in springs if a_ == at), sympy.Integer(0))
        reactions[sup.at] = reactions.get(sup.at, 0) + r
    reactions = {k: tidy(v) for k, v in reactions.items()}
    displacements = {stations[i]: tidy(disp[i]) for i in range(n)}

    gap_forces, conditions = {}, []
    # a condition is solved for the first real symbol it is linear in (a load, dT), else a positive one
    prefer = sorted(syms.values(), key=lambda s: bool(s.is_positive))
    for g, a, b, s1, s2, c in gaps:
        if g.name in lam:
            force = -lam_v[g.name] if g.kind == "contact" else lam_v[g.name]
            gap_forces[g.name] = tidy(force)
            conditions.append(_relation(lam_v[g.name], prefer).xreplace(back))
        else:
            gap_forces[g.name] = sympy.Integer(0)
            conditions.append(_relation(c - measure(a, b, s1, s2, disp), prefer).xreplace(back))
    notes = []
    kept = []
    for rel in conditions:
        if rel is sympy.true:
            continue
        kept.append(rel)
        if rel is sympy.false:
            notes.append("the contact state " + _state_text(closed) + (
                " never holds, whatever the symbols' values" if used_symbols(model) else
                " does not hold for the model's values") + ": these formulas do not apply")
            continue
        lhs = (rel.lhs - rel.rhs).xreplace(subs)
        if not lhs.free_symbols:  # every symbol in it has a value: check it
            value = float(lhs)
            scale = max(abs(float(rel.lhs.xreplace(subs))), abs(float(rel.rhs.xreplace(subs))), 1e-300)
            holds = value >= -1e-9 * scale if isinstance(rel, sympy.GreaterThan) else value <= 1e-9 * scale
            if not holds:
                notes.append(f"condition {rel} fails for the given values: the assumed contact "
                             "state does not hold, so these formulas do not apply to them")
    return ClosedForm(model=model, case=name, symbols=syms, values=values,
                      displacements=displacements, reactions=reactions, axial_forces=axial,
                      stresses=stress, gap_forces=gap_forces, gap_closed=closed,
                      assumed=tuple(assume), conditions=tuple(kept), notes=tuple(notes))


def _state_text(closed):
    if not closed:
        return "(no gaps)"
    return "(" + ", ".join(f"'{g}' {'closed' if c else 'open'}" for g, c in closed.items()) + ")"


# --- the numeric twin ----------------------------------------------------------------
def numeric_model(model: Model) -> Model:
    """Return ``model`` with every symbol replaced by its value (floats in SI).

    Raises
    ------
    ModelError
        When a symbol that the model uses has no value.
    """
    values = {}
    for d in model.symbols:
        values[sympy.Symbol(d.name, real=True)] = _rat(d.value) if d.value is not None else None
    subs = {k: v for k, v in values.items() if v is not None}
    memo = {}

    def conv(obj, where=""):
        if isinstance(obj, sympy.Basic):
            v = obj.xreplace(subs)
            if v.free_symbols:
                names = ", ".join(sorted(f"'{s.name}'" for s in v.free_symbols))
                raise ModelError(f"symbol(s) {names} have no value, so the model cannot be solved "
                                 "numerically", file=model.source)
            return _finite_real(obj, v, where, subs, model.source)
        if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
            if id(obj) in memo:
                return memo[id(obj)]
            label = type(obj).__name__.lower()
            own = f"{label} '{obj.name}'" if isinstance(getattr(obj, "name", None), str) else label
            changes = {f.name: conv(getattr(obj, f.name), f"{own} {f.name}")
                       for f in dataclasses.fields(obj)
                       if f.name not in ("symbols", "units", "source", "title")}
            new = dataclasses.replace(obj, **changes)
            memo[id(obj)] = new
            return new
        if isinstance(obj, tuple):
            return tuple(conv(o, where) for o in obj)
        return obj

    return conv(model)


def _finite_real(expr, value, where, subs, source) -> float:
    """``value`` as a float, or one error naming the place and the symbol values."""
    try:
        z = complex(value.evalf(30))
    except (TypeError, ValueError, OverflowError):
        z = complex("nan")
    if z.imag == 0 and math.isfinite(z.real):
        return float(z.real)
    used = sorted(expr.free_symbols, key=lambda s: s.name)
    shown = ", ".join(f"{s.name} = {float(subs[s]):g}" for s in used if s in subs)
    what = ("not a real number" if math.isfinite(z.imag) and z.imag != 0 and math.isfinite(z.real)
            else "not a finite number")
    raise ModelError(f"{where}: '{expr}' is {what} for the symbol values"
                     + (f" {shown} (SI)" if shown else ""), file=source)


# --- reports -------------------------------------------------------------------------
def _entries(cf: ClosedForm, numeric):
    """Yield (group, key, expr, numeric SI value or None, unit key)."""
    model = cf.model
    for st, e in cf.reactions.items():
        yield "reactions", st, e, (numeric.reaction(st) if numeric is not None else None), "force"
    for st, e in cf.displacements.items():
        yield "displacements", st, e, (numeric.displacement(st) if numeric is not None else None), "displacement"
    for seg, (e, _) in cf.axial_forces.items():
        yield "axial_forces", seg, e, (float(numeric.force(seg)[0]) if numeric is not None else None), "force"
    for seg, (e, _) in cf.stresses.items():
        i = model.segment_index(seg)
        yield "stresses", seg, e, (float(numeric.stress[i][0]) if numeric is not None else None), "stress"
    for g, e in cf.gap_forces.items():
        yield "gaps", g, e, (numeric.gap(g)["force"] if numeric is not None else None), "force"


def closed_form_dict(cf: ClosedForm, numeric=None, units=None, only=None, compare=True) -> dict:
    """The closed forms as plain data, keyed as in ``axialfe closed-form --format json``.

    ``numeric`` is the numeric solver's :class:`~axialfe.results.CaseResult` of
    the same case (or None).  With ``compare`` True, a closed form whose value
    differs from it by more than :data:`TOLERANCE` (relative to the largest
    value of the same quantity) raises :class:`SolveError`; with False the
    differences are listed only; with None (numeric values of another contact
    state) they are not computed.
    """
    units = units or cf.model.units
    rows = list(_entries(cf, numeric))
    scale = {}
    for group, _, e, num, ukey in rows:
        v = cf.evaluate(e)
        for x in (v, num):
            if x is not None:
                scale[ukey] = max(scale.get(ukey, 0.0), abs(x))
    data = {"title": cf.model.title, "case": cf.case,
            "cases": [c.name for c in (*cf.model.all_cases, *cf.model.combinations)],
            "units": units.as_dict(),
            "symbols": {d.name: d.text for d in cf.model.symbols},
            "assumptions": {n: ("positive" if s.is_positive else "real") for n, s in cf.symbols.items()},
            "state": {g: ("closed" if c else "open") for g, c in cf.gap_closed.items()},
            "assumed": list(cf.assumed)}
    for group in QUANTITIES[:-1]:
        if only is None or group in only:
            data[group] = {}
    for group, key, e, num, ukey in rows:
        v = cf.evaluate(e)
        if v is None:
            num = None
        diff = None
        if v is not None and num is not None and compare is not None:
            diff = abs(v - num) / scale[ukey] if scale.get(ukey) else 0.0
            if compare is True and diff > TOLERANCE:
                raise SolveError(f"the closed form of {group[:-1].replace('_', ' ')} '{key}' "
                                 f"({e}) gives {v:.12g} but the numeric solver {num:.12g} "
                                 f"(relative difference {diff:.1e} > {TOLERANCE:g})",
                                 file=cf.model.source)
        if group not in data:
            continue
        f = units.factor(ukey)
        data[group][key] = {"expression": str(e), "latex": sympy.latex(e),
                            "value": v / f if v is not None else None,
                            "numeric": num / f if num is not None else None,
                            "relative_difference": diff}
    data["conditions"] = [str(c) for c in cf.conditions]  # always: where the formulas apply
    data["conditions_latex"] = [sympy.latex(c) for c in cf.conditions]
    data["notes"] = list(cf.notes)
    return data


_TITLES = {"reactions": ("reactions (force of the support on the bar, + toward +x)", "force"),
           "displacements": ("station displacements (+ toward +x)", "displacement"),
           "axial_forces": ("axial force at each segment's 'from' end (+ in tension)", "force"),
           "stresses": ("stress at each segment's 'from' end (+ in tension)", "stress"),
           "gaps": ("gap forces (+ in tension, 0 when open)", "force")}


def closed_form_text(data: dict, latex: bool = False, cautions=()) -> str:
    """The terminal report of :func:`closed_form_dict`'s data."""
    key = "latex" if latex else "expression"
    out = [f"axialfe closed form: {data['title']} (case '{data['case']}')"]
    others = [c for c in data.get("cases", ()) if c != data["case"]]
    if others:
        out.append("other cases: " + ", ".join(others) + " (choose one with --case NAME)")
    if not data["symbols"]:
        out.append("no [symbols] declared, so each closed form is an exact number; for formulas, "
                   "declare symbols (e.g. [symbols] P = \"18 kN\") and use them as values "
                   "(force = \"P\")")
    else:
        out.append("symbols: " + ", ".join(f"{n} = {v}" if v is not None else f"{n} (no value)"
                                           for n, v in data["symbols"].items()))
        pos = [n for n, a in data["assumptions"].items() if a == "positive"]
        out.append("assumed: all symbols real" + (f"; positive: {', '.join(pos)}" if pos else ""))
    out.append("closed forms in SI base units (m, N, Pa, K, kg); values in "
               + ", ".join(f"{k} {v}" for k, v in data["units"].items()))
    if data["state"]:
        out.append("contact state: " + ", ".join(
            f"'{g}' {s}" + (" (assumed)" if g in data["assumed"] else "")
            for g, s in data["state"].items()))
    if data["conditions"]:
        out.append("the formulas hold while all of these hold:")
        out += [f"  {c}" for c in data["conditions_latex" if latex else "conditions"]]
    elif data["state"]:
        out.append("the contact state holds " + ("for any values of the symbols" if data["symbols"]
                                                 else "without a condition left"))
    for group, (title, ukey) in _TITLES.items():
        if group not in data or not data[group]:
            continue
        out += ["", f" {title} [{data['units'][ukey]}]"]
        width = max((len(k) for k in data[group]), default=0)
        for name, entry in data[group].items():
            out.append(f"  {name.ljust(width)} = {entry[key]}")
            if entry["value"] is not None and (entry["expression"] != "0" or entry["numeric"] is not None):
                line = f"  {' ' * width}   = {entry['value']:.6g}"
                if entry["numeric"] is not None and entry["relative_difference"] is not None:
                    line += (f"   numeric {entry['numeric']:.6g}, relative difference "
                             f"{entry['relative_difference']:.1e}")
                elif entry["numeric"] is not None:
                    line += f"   (numeric, other contact state: {entry['numeric']:.6g})"
                out.append(line)
    for note in data.get("notes", []):
        out.append(f"note: {note}")
    if cautions:
        out += ["", "cautions:"] + [f" - {c}" for c in cautions]
    return "\n".join(out) + "\n"
