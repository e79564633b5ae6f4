#!/usr/bin/env python3
"""Careful general-purpose reference for `junctionfit fit FOLDER --area A --json` (Simmons model, area known).

For each I-V file (CSV "Voltage (V),Current (A)", '#' lines skipped) in the folder, sorted by name:
  * points used: finite, same sign of V and I, I != 0, and |V| > 1e-12 V (a float-stepped "zero" bias such as 1e-16 V
    carries no information the model can use: the model current there is below 1e-20 A and its ln is set by rounding);
  * residuals r_i = ln|I_i| - ln(A |J(V_i; phi, d)|), uniform weights (the relative noise is the same at every point);
  * J: Simmons rectangular barrier, beta = 1, m* = m_e (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963), intermediate form
    for e|V| < phi, J = e/(2 pi h d^2) [(phi - eV/2) exp(-A0 sqrt(phi - eV/2)) - (phi + eV/2) exp(-A0 sqrt(phi + eV/2))],
    A0 = 2 d sqrt(2 m_e)/hbar; for e|V| >= phi the triangular-barrier form with ds = d phi/(e|V|), mean phi/2 (beta = 1);
  * solver: scipy.optimize.least_squares(method='lm') (MINPACK lmder) on x = (ln phi, ln d) with the analytic Jacobian,
    from a 3 x 3 start grid phi in {1, 2, 4} eV x d in {0.8, 1.5, 3} nm; the lowest sum of squares wins; ftol = xtol = 1e-9
    (the CLI's own stopping tolerances), gtol at scipy's default;
  * standard errors: s^2 (J^T J)^-1 in x at the optimum, s^2 = RSS/(m - 2), mapped back by the delta method
    (SE(phi) = phi SE(ln phi)).
Constants: CODATA 2018 (e, h exact; m_e = 9.1093837015e-31 kg).
Prints CSV: file,phi_eV,d_nm,se_phi_eV,se_d_nm,rss,points_used,nfev. Usage: scipy_simmons_fit.py FOLDER AREA_UM2
"""
import math
import os
import sys

import numpy as np
from scipy.optimize import least_squares

E = 1.602176634e-19
H = 6.62607015e-34
HBAR = H / (2 * math.pi)
ME = 9.1093837015e-31
K = E / (2 * math.pi * H)
DECAY = 2 * math.sqrt(2 * ME) / HBAR


def log_current_and_gradient(v, phi, d, area):
    """ln|I| and its derivatives with respect to ln phi and ln d (phi in J, d in m)."""
    u = E * np.abs(v)
    high = u >= phi
    # intermediate form: ds = d, a = phi - u/2, b = phi + u/2
    # high-voltage form: ds = d phi / u, a = phi/2, b = phi/2 + u
    us = np.where(high, u, 1.0)
    ds = np.where(high, d * phi / us, d)
    a = np.where(high, 0.5 * phi, phi - 0.5 * u)
    b = np.where(high, 0.5 * phi + u, phi + 0.5 * u)
    c = DECAY * ds
    sa, sb = np.sqrt(a), np.sqrt(b)
    ea, eb = np.exp(-c * sa), np.exp(-c * sb)
    f = a * ea - b * eb  # J = K/ds^2 * f, f < 0 for u > 0; use |f|
    # d f / d a, d f / d b, d f / d c
    fa = ea * (1 - 0.5 * c * sa)
    fb = -eb * (1 - 0.5 * c * sb)
    fc = -a * sa * ea + b * sb * eb
    # chain rule to phi and d (at fixed u)
    da_dphi = np.where(high, 0.5, 1.0)
    db_dphi = np.where(high, 0.5, 1.0)
    dds_dphi = np.where(high, d / us, 0.0)
    dds_dd = np.where(high, phi / us, 1.0)
    dlnf_dphi = (fa * da_dphi + fb * db_dphi + fc * DECAY * dds_dphi) / f
    dlnf_dd = fc * DECAY * dds_dd / f
    logi = math.log(area * K) - 2 * np.log(ds) + np.log(np.abs(f))
    g_phi = -2 * dds_dphi / ds + dlnf_dphi
    g_d = -2 * dds_dd / ds + dlnf_dd
    return logi, phi * g_phi, d * g_d


def read_curve(path):
    v, i = [], []
    with open(path) as f:
        for line in f:
            s = line.strip()
            if not s or s.startswith("#"):
                continue
            parts = s.split(",")
            try:
                v.append(float(parts[0]))
                i.append(float(parts[1]))
            except (ValueError, IndexError):
                continue  # the column header
    return np.array(v), np.array(i)


def fit(v, i, area):
    ok = np.isfinite(v) & np.isfinite(i) & (np.sign(v) == np.sign(i)) & (i != 0) & (np.abs(v) > 1e-12)
    v, y = v[ok], np.log(np.abs(i[ok]))

    def res(x):
        logi, _, _ = log_current_and_gradient(v, E * math.exp(x[0]), 1e-9 * math.exp(x[1]), area)
        return y - logi

    def jac(x):
        _, gp, gd = log_current_and_gradient(v, E * math.exp(x[0]), 1e-9 * math.exp(x[1]), area)
        return -np.column_stack((gp, gd))

    best, nfev = None, 0
    for phi0 in (1.0, 2.0, 4.0):
        for d0 in (0.8, 1.5, 3.0):
            with np.errstate(all="ignore"):
                try:
                    r = least_squares(res, [math.log(phi0), math.log(d0)], jac=jac, method="lm", xtol=1e-9, ftol=1e-9)
                except ValueError:
                    continue
            nfev += r.nfev
            if not np.all(np.isfinite(r.fun)):
                continue
            cost = float(r.fun @ r.fun)
            if best is None or cost < best[0]:
                best = (cost, r)
    cost, r = best
    m = len(y)
    s2 = cost / (m - 2)
    cov = s2 * np.linalg.inv(r.jac.T @ r.jac)
    phi, d = math.exp(r.x[0]), math.exp(r.x[1])
    return phi, d, phi * math.sqrt(cov[0, 0]), d * math.sqrt(cov[1, 1]), cost, m, nfev


def main():
    folder, area = sys.argv[1], float(sys.argv[2]) * 1e-12
    out = sys.stdout
    out.write("file,phi_eV,d_nm,se_phi_eV,se_d_nm,rss,points_used,nfev\n")
    for name in sorted(os.listdir(folder)):
        if not name.endswith(".csv"):
            continue
        path = os.path.join(folder, name)
        phi, d, sp, sd, rss, m, nfev = fit(*read_curve(path), area)
        out.write(f"{path},{phi!r},{d!r},{sp!r},{sd!r},{rss!r},{m},{nfev}\n")


if __name__ == "__main__":
    main()
