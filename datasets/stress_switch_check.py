#!/usr/bin/env python3
"""Independent check of the bistability of models/stress_switch.xml (invented demo model).

Reads the SBML file itself (xml.etree + a small MathML-to-sympy converter for the operators the model uses), builds
the ODEs, verifies the two conservation laws symbolically, locates the saddle-node folds in the control parameter
'stimulus' with sympy.nsolve (F = 0 and det(dF/dx) = 0 on the reduced system, 30 significant digits; cross-checked as the
turning points d stimulus / d ZarnA = 0 of the steady-state curve, agreement to 30 digits), and confirms
hysteresis by integrating the full 4-species system with scipy's BDF from the low and the high state.

Usage: python3 datasets/stress_switch_check.py [path/to/stress_switch.xml]
Tested with Python 3, numpy 2.4.6, sympy 1.14.0, scipy 1.17.1.
"""
import sys
import xml.etree.ElementTree as ET

import mpmath
import numpy as np
import sympy as sp
from scipy.integrate import solve_ivp

SBML = "{http://www.sbml.org/sbml/level3/version2/core}"
MML = "{http://www.w3.org/1998/Math/MathML}"


def mathml(node, syms):
    tag = node.tag.replace(MML, "")
    if tag == "math":
        return mathml(list(node)[0], syms)
    if tag == "ci":
        return syms[node.text.strip()]
    if tag == "cn":
        return sp.Rational(node.text.strip())
    if tag == "apply":
        op, *args = list(node)
        op = op.tag.replace(MML, "")
        a = [mathml(x, syms) for x in args]
        if op == "times":
            return sp.Mul(*a)
        if op == "plus":
            return sp.Add(*a)
        if op == "minus":
            return a[0] - a[1] if len(a) == 2 else -a[0]
        if op == "divide":
            return a[0] / a[1]
        if op == "power":
            return a[0] ** a[1]
    raise ValueError("MathML element not handled: " + tag)


def load(path):
    model = ET.parse(path).getroot().find(SBML + "model")
    syms, values = {}, {}
    for c in model.iter(SBML + "compartment"):
        syms[c.get("id")] = sp.Symbol(c.get("id"))
        values[c.get("id")] = sp.Rational(c.get("size"))   # exact decimal value as written
    species = []
    init = {}
    for s in model.iter(SBML + "species"):
        sid = s.get("id")
        syms[sid] = sp.Symbol(sid)
        species.append(sid)
        init[sid] = sp.Rational(s.get("initialConcentration"))
    for p in model.iter(SBML + "parameter"):
        syms[p.get("id")] = sp.Symbol(p.get("id"))
        values[p.get("id")] = sp.Rational(p.get("value"))
    rhs = {s: sp.Integer(0) for s in species}
    stoich = []
    for r in model.iter(SBML + "reaction"):
        rate = mathml(r.find(SBML + "kineticLaw").find(MML + "math"), syms)
        col = {s: 0 for s in species}
        for lst, sign in (("listOfReactants", -1), ("listOfProducts", 1)):
            node = r.find(SBML + lst)
            if node is None:
                continue
            for ref in node.iter(SBML + "speciesReference"):
                col[ref.get("species")] += sign * sp.Rational(ref.get("stoichiometry"))
        stoich.append([col[s] for s in species])
        for s in species:
            rhs[s] += col[s] * rate / syms["cell"]   # concentration rate = amount rate / volume
    return species, syms, values, init, rhs, np.array(stoich, dtype=object).T


def main(path):
    mpmath.mp.dps = 30
    species, syms, values, init, rhs, N = load(path)
    print("species:", species)
    # Conservation laws: left null space of the stoichiometry matrix, then checked on the ODEs symbolically.
    left = sp.Matrix(N.tolist()).T.nullspace()
    print("conservation vectors (left null space of N):", [list(v) for v in left])
    for v in left:
        total = sp.simplify(sum(v[i] * rhs[s] for i, s in enumerate(species)))
        assert total == 0, total
    # Reduce with ZarnI = 1 - ZarnA, QuelI = 1 - QuelA (totals from the initial concentrations).
    zt = init["ZarnI"] + init["ZarnA"]
    qt = init["QuelA"] + init["QuelI"]
    x, y, S = syms["ZarnA"], syms["QuelA"], syms["stimulus"]
    fixed = {syms[k]: v for k, v in values.items() if k != "stimulus"}
    red = {syms["ZarnI"]: zt - x, syms["QuelI"]: qt - y}
    F = sp.Matrix([rhs["ZarnA"].subs(red).subs(fixed), rhs["QuelA"].subs(red).subs(fixed)])
    J = F.jacobian([x, y])
    system = list(F) + [J.det()]
    # Coarse scan of steady states along x to seed the fold search: solve F2 = 0 for y, then F1 = 0 for S.
    y_of_x = sp.solve(F[1], y)[0]
    s_expr = sp.solve(F[0].subs(y, y_of_x), S)[0]
    s_of_x = sp.lambdify(x, s_expr, "numpy")
    ds_dx = sp.diff(s_expr, x)
    xs = np.linspace(1e-4, float(zt) - 1e-4, 200001)
    ss = s_of_x(xs)
    turn = np.where(np.diff(np.sign(np.diff(ss))) != 0)[0] + 1
    folds = []
    for i in turn:
        guess = (xs[i], float(y_of_x.subs(x, xs[i])), ss[i])
        sol = sp.nsolve(system, [x, y, S], guess, prec=30)
        folds.append(sol)
        # Second route: turning point of the steady-state curve stimulus(ZarnA), d stimulus / d ZarnA = 0.
        x_turn, s_turn = sp.nsolve([ds_dx, S - s_expr], [x, S], (xs[i], ss[i]), prec=30)
        print("  turning point of stimulus(ZarnA): |dx| = %.1e, |dstimulus| = %.1e"
              % (abs(x_turn - sol[0]), abs(s_turn - sol[2])))
        assert abs(x_turn - sol[0]) < 1e-20 and abs(s_turn - sol[2]) < 1e-20
        print("fold: stimulus = %s, ZarnA = %s, QuelA = %s" % (sp.N(sol[2], 20), sp.N(sol[0], 20),
                                                                  sp.N(sol[1], 20)))
    assert len(folds) == 2, "expected two folds"
    s_on, s_off = max(float(f[2]) for f in folds), min(float(f[2]) for f in folds)
    # Hysteresis: integrate the full system (4 species) to steady state from the low and the high state.
    f_full = sp.lambdify([S] + [syms[s] for s in species],
                         [rhs[s].subs(fixed) for s in species], "numpy")

    def settle(stim, y0):
        sol = solve_ivp(lambda t, u: f_full(stim, *u), (0, 2000), y0, method="BDF", rtol=1e-10, atol=1e-12)
        return sol.y[:, -1]

    zt, qt = float(zt), float(qt)
    low0 = [zt, 0.0, qt, 0.0]
    high0 = [0.0, zt, 0.0, qt]
    for stim in (0.0, 0.5 * s_off, 0.5 * (s_on + s_off), s_on * 1.2, 4.0):
        a = settle(stim, low0)
        b = settle(stim, high0)
        print("stimulus %.4f: from low ZarnA = %.6f, from high ZarnA = %.6f, totals %.3e %.3e"
              % (stim, a[1], b[1], a[0] + a[1] - zt, a[2] + a[3] - qt))
    mid = 0.5 * (s_on + s_off)
    assert settle(mid, high0)[1] - settle(mid, low0)[1] > 0.3, "two distinct states between the folds"
    assert abs(settle(1.2 * s_on, high0)[1] - settle(1.2 * s_on, low0)[1]) < 1e-6, "one state above the folds"


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else "models/stress_switch.xml")
