"""Taylor coefficients of 1/Γ(z) about z = 0 (Abramowitz & Stegun 6.1.34, after Wrench 1968),
recomputed with mpmath at 50 digits. shared/numerics/grf/besselK.ts embeds c_1 … c_26 (rounded to 17
significant digits) for Temme's gam1/gam2. Run: python3 make_reciprocal_gamma_coefficients.py"""
import mpmath as mp

mp.mp.dps = 50
for k, c in enumerate(mp.taylor(mp.rgamma, 0, 26)):
    if k >= 1:
        print(f"  {mp.nstr(c, 17, min_fixed=0, max_fixed=0)},  // c_{k}")
