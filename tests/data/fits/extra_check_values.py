#!/usr/bin/env python3
"""Exact reference values marked [X] in tests/unit/fitting/edge_cases_test.cpp.

Fractions for the regressions, 50-digit decimals for square roots, the t quantile of the
calibration check-value script. Run: CHECK_VALUES=path/to/calibration-check-values.py python3 extra_check_values.py
"""
from fractions import Fraction as Fr
from decimal import Decimal, getcontext
import sys
import importlib.util
import os
# The domain brief's check-value script (exact rational arithmetic); pass its path in CHECK_VALUES.
spec = importlib.util.spec_from_file_location("cv", os.environ.get("CHECK_VALUES", "calibration-check-values.py"))
cv = importlib.util.module_from_spec(spec); spec.loader.exec_module(cv)
getcontext().prec = 50
def D(q): return Decimal(q.numerator)/Decimal(q.denominator)
def g(v): return "%.12g" % float(v)

def origin(x, y, w, y0, m):
    n = len(x); sw = sum(w); w = [wi*n/sw for wi in w]
    sx2 = sum(wi*xi*xi for wi, xi in zip(w, x))
    b = sum(wi*xi*yi for wi, xi, yi in zip(w, x, y))/sx2
    sse = sum(wi*(yi-b*xi)**2 for wi, xi, yi in zip(w, x, y))
    s2 = sse/(n-1)
    x0 = y0/b
    return b, s2, x0, sx2, w, sw
x = [Fr(v) for v in "1 2 4 8 16".split()]
y = [Fr(v) for v in "2.05 3.98 8.1 15.7 32.4".split()]
y0, m = Fr(10), 2
t = cv.t_q(0.975, 4)
for name, w in [("none", [Fr(1)]*5), ("1/x", [1/v for v in x])]:
    b, s2, x0, sx2, wn, sw = origin(x, y, w, y0, m)
    w0 = Fr(1) if name == "none" else (1/x0)*len(x)/sw
    sx0 = D(s2).sqrt()/D(b)*D(1/(m*w0) + y0**2/(b*b*sx2)).sqrt()
    r2 = 1 - (s2*4)/sum(wi*yi*yi for wi, yi in zip(wn, y))
    print(name, "b", g(b), "se_b", g(D(s2/sx2).sqrt()), "s", g(D(s2).sqrt()), "R0^2", g(r2), "x0", g(x0), "w0", g(w0), "sx0", g(sx0), "half", g(float(sx0)*t))
# MRF on S3
c = [Fr(v) for v in "1 5 10 50 100".split()]
a = [Fr(v) for v in "1020 5150 10080 49700 98900".split()]
rf = [ai/ci for ai, ci in zip(a, c)]; n = 5
RF = sum(rf)/n
sdrf2 = sum((v-RF)**2 for v in rf)/(n-1)
sse = sum((ai - RF*ci)**2 for ai, ci in zip(a, c))
s2 = sse/(n-1)
y0, m = Fr(20000), 3
x0 = y0/RF
# Relative-error model of the mean RF: s_x0 = x0*(s_RF/RFbar)*sqrt(1/m + 1/n); ICH sigma = s_RF*x_low.
sx0 = D(x0)*D(sdrf2).sqrt()/D(RF)*D(Fr(1, m) + Fr(1, n)).sqrt()
sig = D(sdrf2).sqrt()*D(min(c))
print("MRF s", g(D(s2).sqrt()), "R2", g(1 - sse/sum(ai*ai for ai in a)), "x0", g(x0), "sx0", g(sx0), "half", g(float(sx0)*t), "lod", g(Decimal("3.3")*sig/D(RF)), "loq", g(10*sig/D(RF)))
# quadratic weighted 1/x on S2 data, inverse at y0=60, m=2
xq = [Fr(i) for i in range(1, 11)]
yq = [Fr(v) for v in "11.9 21.3 30.7 39.5 48.4 56.5 64.7 72.3 79.9 87.0".split()]
wq = [1/v for v in xq]; n = 10; sw = sum(wq); wq = [wi*n/sw for wi in wq]
S = [sum(wi*xi**k for wi, xi in zip(wq, xq)) for k in range(5)]
M = [[S[i+j] for j in range(3)] for i in range(3)]
v = [sum(wi*yi*xi**k for wi, xi, yi in zip(wq, xq, yq)) for k in range(3)]
qa, qb, qc = cv.solve3(M, v)
sse = sum(wi*(yi-qa-qb*xi-qc*xi*xi)**2 for wi, xi, yi in zip(wq, xq, yq))
s2 = sse/(n-3)
Mi = cv.inv3(M)
print("quad 1/x a b c", g(qa), g(qb), g(qc), "s", g(D(s2).sqrt()), "se", " ".join(g(D(s2*Mi[i][i]).sqrt()) for i in range(3)))
y0 = Decimal(60); m = 2
A, B, C = D(qa), D(qb), D(qc)
disc = B*B - 4*C*(A-y0)
r1 = (-B + disc.sqrt())/(2*C); r2 = (-B - disc.sqrt())/(2*C)
x0 = r1 if 1 <= r1 <= 10 else r2
w0 = (1/x0) * n / D(sw)
gv = [Decimal(1), x0, x0*x0]
qf = sum(gv[i]*D(Mi[i][j])*gv[j] for i in range(3) for j in range(3))
E = B + 2*C*x0
sx0 = D(s2).sqrt()/abs(E)*(1/(m*w0) + qf).sqrt()
print("quad 1/x inverse y0=60 m=2: x0", g(x0), "w0", g(w0), "sx0", g(sx0), "half", g(float(sx0)*cv.t_q(0.975, 7)))
# excluded-point check on M1: back-calc of (6, 20.0)
b = Fr(1081, 560); a0 = Fr(85, 56)
xb = (Fr(20) - a0)/b
print("M1 excluded (6,20): back", g(xb), "re", g(100*(xb-6)/6), "fitted", g(a0+6*b))
# Quadratic (unweighted) on narrow ranges far from zero, the responses taken as the doubles the
# program reads (Fraction(float) is exact): x0 and s_x0 (m = 1) at y0 = the middle reading,
# §3.4 delta method with exact M^-1 and 50-digit square roots.
def narrow_quadratic(xs, ys, y0):
    x = [Fr(float(v)) for v in xs]; y = [Fr(float(v)) for v in ys]; y0 = Fr(float(y0))
    q = cv.quad_fit(x, y)
    A, B, C = D(q["a"] - y0), D(q["b"]), D(q["c"])
    root = (B*B - 4*C*A).sqrt()
    mid = D((max(x) + min(x))/2)
    r1, r2 = (-B + root)/(2*C), (-B - root)/(2*C)
    x0 = r1 if abs(r1 - mid) < abs(r2 - mid) else r2
    Mi = cv.inv3(q["M"])
    gv = [Decimal(1), x0, x0*x0]
    qf = sum(gv[i]*D(Mi[i][j])*gv[j] for i in range(3) for j in range(3))
    s2 = D(q["s2"])
    return x0, (s2*(1 + qf)).sqrt()/abs(B + 2*C*x0)
for name, xs, ys, y0 in [
        ("narrow 1e3", "996 997 998 999 1000 1001 1002 1003 1004",
         "2490.743 2493.259 2495.781 2498.300 2500.789 2503.285 2505.796 2508.259 2510.733", "2500.789"),
        ("narrow 1e5", "99960 99970 99980 99990 100000 100010 100020 100030 100040",
         "3998.547 3999.011 3999.468 3999.894 4000.301 4000.662 4001.051 4001.410 4001.750", "4000.301")]:
    x0, sx0 = narrow_quadratic(xs.split(), ys.split(), y0)
    print("quad", name, "y0", y0, "x0", "%.15g" % float(x0), "sx0", "%.12g" % float(sx0))
# Mandel's PW = (SSE_lin - SSE_quad)/s_y2² on a very precise line (residual SD ~ 1e-4, y up to
# 123), exact fractions of the double inputs, unweighted, 1/x^2 and 1/y^2 (normalised weights).
def wquad_sse(x, y, w):
    n = len(x); sw = sum(w); w = [wi*n/sw for wi in w]
    S = [sum(wi*xi**k for wi, xi in zip(w, x)) for k in range(5)]
    M = [[S[i+j] for j in range(3)] for i in range(3)]
    v = [sum(wi*yi*xi**k for wi, xi, yi in zip(w, x, y)) for k in range(3)]
    qa, qb, qc = cv.solve3(M, v)
    return sum(wi*(yi - qa - qb*xi - qc*xi*xi)**2 for wi, xi, yi in zip(w, x, y))
xp = [Fr(i) for i in range(1, 11)]
yp = [Fr(float(v)) for v in ("12.357953 24.703709 37.049314 49.394984 61.740601 74.086352 "
                             "86.432163 98.777774 111.123514 123.469114").split()]
for name, w in [("none", [Fr(1)]*10), ("1/x^2", [1/(v*v) for v in xp]),
                ("1/y^2", [1/(v*v) for v in yp])]:
    line = cv.wls_line(xp, yp, w)
    sq = wquad_sse(xp, yp, w)
    print("Mandel precise line", name, "PW", "%.15g" % float((line["sse"] - sq)/(sq/7)))
