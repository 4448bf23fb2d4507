"""Reference values for shared/numerics/grf/besselK.ts, logGamma.ts and maternGeneral.ts.
K_ν(x) and e^x K_ν(x) from scipy.special.kv / kve (SciPy's AMOS-based routines); ln K_ν(x) where
K_ν over- or underflows a double, ln Γ and the general Matérn correlation from mpmath at 40 digits
(independent of SciPy). Writes bessel_fixture.json next to this script.
Run: python3 make_bessel_fixture.py"""
import json
import os

import mpmath as mp
import numpy as np
from scipy import special

mp.mp.dps = 40

orders = [0.0, 0.1, 0.25, 0.5, 0.75, 1.0, 1.3, 1.5, 2.0, 2.5, 3.7, 5.0, 7.2, 12.0, 20.0]
args = [1e-6, 1e-3, 0.05, 0.3, 1.0, 1.9, 2.0, 2.1, 3.0, 5.0, 10.0, 25.0, 60.0, 150.0, 800.0]

bessel = []
for nu in orders:
    for x in args:
        kv = float(special.kv(nu, x))
        kve = float(special.kve(nu, x))
        logk = float(mp.log(mp.besselk(nu, x)))
        bessel.append({"nu": nu, "x": x, "kv": kv if np.isfinite(kv) and kv > 1e-300 else None,
                       "kve": kve if np.isfinite(kve) else None, "logk": logk})

gamma = [{"x": x, "lgamma": float(special.gammaln(x))}
         for x in [1e-8, 0.01, 0.1, 0.3, 0.5, 0.9, 1.0, 1.5, 2.0, 2.5, 3.7, 10.0, 33.3, 170.5, 1e4]]


def matern(nu, r):
    if r == 0:
        return mp.mpf(1)
    s = mp.sqrt(2 * mp.mpf(nu)) * r
    return mp.power(2, 1 - nu) / mp.gamma(nu) * mp.power(s, nu) * mp.besselk(nu, s)


materns = []
for nu in [0.2, 0.5, 1.0, 1.5, 2.5, 4.1, 9.5, 40.0]:
    for r in [0.0, 1e-9, 1e-4, 0.01, 0.1, 0.5, 1.0, 2.0, 4.0, 10.0, 40.0]:
        materns.append({"nu": nu, "rOverL": r, "rho": float(matern(nu, mp.mpf(r)))})

out = {"source": "scipy " + __import__("scipy").__version__ + " special.kv/kve/gammaln; mpmath " + mp.__version__ + " besselk",
       "bessel": bessel, "logGamma": gamma, "matern": materns}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "bessel_fixture.json"), "w") as f:
    json.dump(out, f, separators=(",", ":"))
