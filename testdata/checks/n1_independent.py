#!/usr/bin/env python3
"""An independent implementation of dragdeck's thrust-from-fan-speed method
(ISA, lift, baseline polar with Korn/Lock wave drag, TSFC model, corrected
fan speed N1k = N1/sqrt(theta_t2) with theta_t2 = theta (1 + 0.2 M^2), thrust
count * delta * F(N1k, M) bilinear in the type's table), written from the
equations in the README's method, not from the Go code. It draws random
cruise snapshots for each type file given and compares `dragdeck point
--n1-pct ... --json` with it: airframe and engine deviation (pp) and thrust (%).
Snapshots outside the table must be said to be so. Opt-in (needs Python 3.11+):

    go build -o /tmp/dragdeck ./cmd/dragdeck
    python3 testdata/checks/n1_independent.py /tmp/dragdeck feed/demo_type.toml:65000 feed/demo/types/dw300.toml:200000
"""
import math, json, subprocess, sys, tomllib, random
P0,T0,G0,R,GAM = 101325.0, 288.15, 9.80665, 287.05287, 1.4
FT, KT = 0.3048, 1852/3600
def isa(h):
    if h <= 11000:
        T = T0 - 0.0065*h; p = P0*(T/T0)**(G0/(0.0065*R))
    else:
        T11 = T0-0.0065*11000; p11 = P0*(T11/T0)**(G0/(0.0065*R))
        T = 216.65; p = p11*math.exp(-G0*(h-11000)/(R*216.65))
    return T, p
def bilinear(xs, ys, z, x, y):  # z[j][i]: row j for ys[j] (Mach), column i for xs[i] (N1k)
    if not (xs[0] <= x <= xs[-1] and ys[0] <= y <= ys[-1]): return None
    i = max(k for k in range(len(xs)-1) if xs[k] <= x) if x < xs[-1] else len(xs)-2
    j = max(k for k in range(len(ys)-1) if ys[k] <= y) if y < ys[-1] else len(ys)-2
    tx = (x-xs[i])/(xs[i+1]-xs[i]); ty = (y-ys[j])/(ys[j+1]-ys[j])
    return (z[j][i]*(1-tx)*(1-ty) + z[j][i+1]*tx*(1-ty) + z[j+1][i]*(1-tx)*ty + z[j+1][i+1]*tx*ty)
def point(ty, W, alt_ft, M, sat_c, ff_kgph, n1):
    h = alt_ft*FT; Tisa, p = isa(h); T = sat_c + 273.15
    delta, theta = p/P0, T/T0
    q = 0.5*GAM*p*M*M; S = ty["wing"]["area_m2"]; b = ty["wing"]["span_m"]
    CL = W*G0/(q*S)
    k = 1/(math.pi*ty["polar"]["oswald"]*b*b/S)
    L = math.radians(ty["wave"]["sweep_deg"])
    Mdd = ty["wave"]["kappa_a"]/math.cos(L) - ty["wave"]["thickness_ratio"]/math.cos(L)**2 - CL/(10*math.cos(L)**3)
    Mcr = Mdd - (0.1/80)**(1/3)
    wave = 20*(M-Mcr)**4 if M > Mcr else 0.0
    CDb = ty["polar"]["cd0"] + k*CL*CL + wave
    th2 = theta*(1+0.2*M*M); n1k = n1/math.sqrt(th2)
    tab = ty["thrust"]
    f = bilinear(tab["n1_corrected_pct"], tab["mach"], tab["fn_per_delta_n"], n1k, M)
    if f is None: return None
    Fn = ty["engine"]["count"]*delta*f
    CDm = Fn/(q*S)
    tsfc = (ty["engine"]["tsfc_a_per_h"] + ty["engine"]["tsfc_b_per_h"]*M)*math.sqrt(theta)  # kg/(kgf h)
    ff_model = tsfc*Fn/G0  # kg/h
    return {"thrust": Fn, "airframe": 100*(CDm-CDb)/CDb, "engine": 100*(ff_kgph/ff_model-1), "n1k": n1k}
random.seed(11)
worst = {"airframe":0, "engine":0, "thrust":0}
n = 0
outside = 0
dragdeck = sys.argv[1]
for arg in sys.argv[2:]:
    path, W0 = arg.rsplit(":", 1)
    W0 = float(W0)
    ty = tomllib.load(open(path, "rb"))
    for _ in range(25):
        W = W0*random.uniform(0.85, 1.15); alt = random.choice([29000, 31000, 33000, 35000, 37000, 39000])
        M = random.uniform(0.70, min(0.85, ty["limits"]["mmo"]-0.01)); sat = isa(alt*FT)[0]-273.15+random.uniform(-12, 15)
        n1 = random.uniform(80, 96); ff = W0/40000*random.uniform(1100, 1700)
        want = point(ty, W, alt, M, sat, ff, n1)
        out = subprocess.run([dragdeck,"point","--type",path,"--weight-kg",repr(W),"--alt-ft",repr(alt),"--mach",repr(M),"--sat-c",repr(sat),"--fuel-flow-kgph",repr(ff),"--n1-pct",repr(n1),"--json"],capture_output=True,text=True)
        if want is None:
            outside += 1
            if "outside the type's thrust table" not in out.stdout+out.stderr: print("outside not said:", out.stdout[:300], out.stderr[:300])
            continue
        got = json.loads(out.stdout)
        worst["airframe"] = max(worst["airframe"], abs(got["drag_deviation_pct"]-want["airframe"]))
        worst["engine"] = max(worst["engine"], abs(got["engine_deviation_pct"]-want["engine"]))
        worst["thrust"] = max(worst["thrust"], abs(got["thrust_n"]/want["thrust"]-1)*100)
        n += 1
print(f"{outside} outside the table, said so; {n} points on {len(sys.argv)-2} types: max |Δ airframe dev| {worst['airframe']:.2e} pp, max |Δ engine dev| {worst['engine']:.2e} pp, max thrust error {worst['thrust']:.2e} %")
if n == 0 or worst["airframe"] > 0.05 or worst["engine"] > 0.05 or worst["thrust"] > 0.2:
    sys.exit("FAIL: beyond 0.05 pp or 0.2 % in thrust")
