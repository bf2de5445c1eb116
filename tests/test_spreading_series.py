"""The exact series for the spreading resistance, checked against outside values and our own FD solution.

Outside values:
- Isoflux circular source on a semi-infinite circular flux tube, a = 1 m, b = 2 m,
  k = 1 W/(m·K): R = 0.1023 K/W to the mean source temperature. The value is the handbook's
  worked result (Rohsenow, Hartnett & Cho (eds.), Handbook of Heat Transfer, 3rd ed.,
  McGraw-Hill 1998, ch. 3, spreading resistance of an isoflux circle on a circular flux tube),
  as quoted in a public worked example read this session.
- The dimensionless spreading resistance of the same flux tube,
  ψ = 4 k a R = 1.08085 − 1.41002 ε + 0.26784 ε³ − 0.00103 ε⁵ + 0.06183 ε⁷
  (Negus & Yovanovich, 1984; Yovanovich's tables; the coefficients are recalled from
  memory, so the check allows 1 %).
- The half-space limits of an isoflux disc: centre rise q a / k, i.e. R_max = 1/(π k a),
  and mean rise 8/(3π²)·q·a/k, i.e. R_avg = 8/(3π² k a) (Carslaw & Jaeger, Conduction of Heat
  in Solids, 2nd ed., 1959, §10.5; from memory).
Our own check: a finite-volume solution of the same axisymmetric problem (written here,
independent of the code under test) on a few thin-wall cases.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from numpy.testing import assert_allclose
from scipy.special import j0, j1, jn_zeros

from workbench._checks import ValidityWarning
from workbench.spreading import spreading_resistance, spreading_resistance_closed_form


def fv_disc(a, b, t, k, h, nr=400, nz=40):
    """Finite-volume solution: (R_avg, R_max) above the 1-D part [K/W].

    Axisymmetric steady conduction in a disc (radius b, thickness t); uniform flux over r < a
    on z = 0 (rest adiabatic), film h to 0 °C on z = t, adiabatic rim. Cell-centred grid with
    a face at r = a; the film enters through half a cell in series. Equations per radian.
    """
    na = max(4, int(round(nr * a / b)))
    r_f = np.concatenate([np.linspace(0, a, na + 1), np.linspace(a, b, nr - na + 1)[1:]])
    dz = np.full(nz, t / nz)
    r_c = 0.5 * (r_f[1:] + r_f[:-1])
    ring = 0.5 * (r_f[1:] ** 2 - r_f[:-1] ** 2)  # ∫ r dr of each ring
    n_r = r_c.size
    idx = np.arange(n_r * nz).reshape(n_r, nz)
    rows, cols, vals = [], [], []
    diag = np.zeros(n_r * nz)

    def couple(p, q, g):
        rows.extend([p, q])
        cols.extend([q, p])
        vals.extend([-g, -g])
        np.add.at(diag, p, g)
        np.add.at(diag, q, g)

    # radial conductances between ring i and i+1 (through the face r_f[i+1])
    g_r = k * r_f[1:-1, None] * dz[None, :] / (r_c[1:] - r_c[:-1])[:, None]
    couple(idx[:-1].ravel(), idx[1:].ravel(), g_r.ravel())
    # axial conductances between layers j and j+1
    g_z = k * ring[:, None] / dz[None, :-1] * np.ones((1, nz - 1))
    couple(idx[:, :-1].ravel(), idx[:, 1:].ravel(), g_z.ravel())
    g_film = ring / (0.5 * dz[-1] / k + 1.0 / h)
    np.add.at(diag, idx[:, -1], g_film)
    rows.append(np.arange(n_r * nz))
    cols.append(np.arange(n_r * nz))
    vals.append(diag)
    A = sp.csr_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))))
    rhs = np.zeros(n_r * nz)
    src = r_f[1:] <= a * (1 + 1e-12)
    rhs[idx[src, 0]] = ring[src]  # q = 1 W/m²
    T = spla.spsolve(A.tocsc(), rhs).reshape(n_r, nz)
    surface = T[:, 0] + 0.5 * dz[0] / k  # half a cell up to the heated face, under the source
    mean = np.sum(surface[src] * ring[src]) / np.sum(ring[src])
    q_total = np.pi * a * a
    r1d = t / (k * np.pi * b * b) + 1.0 / (h * np.pi * b * b)
    return mean / q_total - r1d, surface[0] / q_total - r1d


@pytest.mark.parametrize("a, b, t, k, h", [
    (0.002, 0.1, 0.001, 1.0, 40.0),     # thin filled-polymer wall (issue example)
    (0.0028, 0.165, 0.0025, 167.0, 9.3),  # thin aluminium wall (issue example)
    (0.01, 0.05, 0.002, 0.2, 10.0),     # ABS-like wall, still air
])
def test_series_agrees_with_our_finite_volume_solution(a, b, t, k, h):
    r = spreading_resistance(a, b, t, k, h)
    fv_avg, fv_max = fv_disc(a, b, t, k, h)
    # discretisation error of a 400 x 40 grid: under 1 % on the mean, 0.5 % at the centre
    assert abs(r.average / fv_avg - 1) < 0.01
    assert abs(r.maximum / fv_max - 1) < 0.005


def test_thin_wall_values_and_how_far_the_closed_form_is_off():
    # The two thin-wall cases: the series gives about 242 K/W and 1.51 K/W; the
    # closed form 329.6 and 1.17 (+36 % and -22 %).
    thin = spreading_resistance(0.002, 0.1, 0.001, 1.0, 40.0)
    alu = spreading_resistance(0.0028, 0.165, 0.0025, 167.0, 9.3)
    assert thin.average == pytest.approx(242.46, rel=1e-4)
    assert alu.average == pytest.approx(1.5089, rel=1e-4)
    assert spreading_resistance_closed_form(0.002, 0.1, 0.001, 1.0, 40.0).average / thin.average > 1.3
    assert spreading_resistance_closed_form(0.0028, 0.165, 0.0025, 167.0, 9.3).average / alu.average < 0.8


def test_flux_tube_worked_value_from_the_handbook():
    # a = 1 m, b = 2 m, k = 1 W/(m·K), semi-infinite tube (t >> b; h then does not matter)
    for h in (1.0, 100.0):
        assert spreading_resistance(1.0, 2.0, 40.0, 1.0, h).average == pytest.approx(0.1023, abs=5e-5)


@pytest.mark.parametrize("eps", [0.05, 0.1, 0.25, 0.5, 0.75])
def test_flux_tube_against_the_recalled_correlation(eps):
    a, k = 0.01, 1.0
    psi = 1.08085 - 1.41002 * eps + 0.26784 * eps**3 - 0.00103 * eps**5 + 0.06183 * eps**7
    r = spreading_resistance(a, a / eps, 20 * a / eps, k, 10.0)
    assert r.average == pytest.approx(psi / (4 * k * a), rel=0.01)


def test_half_space_limits():
    a, k = 1e-3, 1.0
    r = spreading_resistance(a, 1.0, 5.0, k, 10.0)   # ε = 1e-3: a small source on a thick plate
    assert r.maximum == pytest.approx(1 / (np.pi * k * a), rel=2e-3)
    assert r.average == pytest.approx(8 / (3 * np.pi**2 * k * a), rel=2e-3)


@pytest.mark.parametrize("a, b, t, k, h", [
    (0.002, 0.1, 0.001, 1.0, 40.0),
    (0.005, 0.08, 0.0015, 0.2, 9.0),
    (1e-3, 1.0, 5.0, 1.0, 10.0),
])
def test_stated_truncation_error_bounds_the_real_one(a, b, t, k, h):
    # reference: the same sums to 300,000 terms (the centre value by its last partial sum,
    # whose own error is then below 1e-6 here)
    lam = jn_zeros(1, 300_000)
    eps, tau, bi = a / b, t / b, h * b / k
    th = np.tanh(lam * tau)
    phi = (th + bi / lam) / (1 + bi / lam * th)
    ref_avg = 4 * b / (np.pi * k * a * a) * np.sum(j1(lam * eps) ** 2 / (lam**3 * j0(lam) ** 2 * phi))
    ref_max = 2 / (np.pi * k * a) * np.sum(j1(lam * eps) / (lam**2 * j0(lam) ** 2 * phi))
    r = spreading_resistance(a, b, t, k, h)
    real = max(abs(r.average / ref_avg - 1), abs(r.maximum / ref_max - 1))
    assert real <= max(r.truncation_error, 2e-6)
    assert r.truncation_error < 1e-4


def test_warns_where_the_series_cannot_resolve_the_source():
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        r = spreading_resistance(1e-7, 1.0, 1e-3, 1.0, 10.0)
    assert any(issubclass(w.category, ValidityWarning) and "truncated" in str(w.message) for w in caught)
    assert r.truncation_error > 1e-3


def test_vectorised_over_candidates_equals_one_by_one():
    k = np.array([0.2, 1.0, 16.0, 167.0])
    t = np.array([0.0025, 0.002, 0.0008, 0.0015])
    together = spreading_resistance(0.005, 0.08, t, k, 9.0)
    for i in range(4):
        one = spreading_resistance(0.005, 0.08, t[i], k[i], 9.0)
        # the batch sums as many terms as its thinnest wall needs, so single and batch
        # results agree within the stated truncation error
        tol = 2 * max(float(one.truncation_error), float(together.truncation_error[i]))
        assert_allclose(together.average[i], one.average, rtol=tol)
        assert_allclose(together.maximum[i], one.maximum, rtol=tol)
