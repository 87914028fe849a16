#!/usr/bin/env python3
"""Compares `dragdeck report --fleet F --events E --format json` on a demo
folder (dragdeck demo --out DIR, or the demo generator with types of your
own) with the folder's truth.json: each tail's type at the end, airframe and
engine flags exactly, recent levels within 0.5 pp, the thrust source, and the
number of steps of each series (a retrofit must give none). Opt-in:

    go build -o /tmp/dragdeck ./cmd/dragdeck
    /tmp/dragdeck demo --out /tmp/fleet --seed 5
    python3 testdata/checks/report_vs_truth.py /tmp/dragdeck /tmp/fleet
"""
import json, subprocess, sys, datetime
dragdeck, out = sys.argv[1], sys.argv[2]
rep = json.loads(subprocess.run([dragdeck,"report","--fleet",out+"/fleet.toml","--events",out+"/events.csv","--format","json",out+"/snapshots"],capture_output=True,text=True,check=True).stdout)
truth = json.load(open(out+"/truth.json"))
tt = {t["tail"]: t for t in truth["tails"]}
errs=[]; maxa=0; maxe=0
print("fleet.types:", {k:(v["tails"], round(v["deviation_pct_median"],2), v["engine_deviation_pct_median"] and round(v["engine_deviation_pct_median"],2)) for k,v in rep["fleet"]["types"].items()})
print("truth types:", [(t["name"], t["tails"], round(t["recent_level_median_pct"],2), t["engine_recent_level_median_pct"] and round(t["engine_recent_level_median_pct"],2)) for t in truth["types"]])
def d(s): return datetime.date.fromisoformat(s[:10])
for r in rep["tails"]:
    t = tt[r["tail"]]
    final = t["retrofit"]["type"] if t["retrofit"] else t["type"]
    if r["type"] != final: errs.append(f'{r["tail"]}: type {r["type"]} want {final}')
    if r["flags"] != t["expected_flags"]: errs.append(f'{r["tail"]} ({t["role"]}): flags {r["flags"]} want {t["expected_flags"]}')
    a = abs(r["deviation_pct"]-t["recent_level_pct"]); maxa=max(maxa,a)
    if a>0.5: errs.append(f'{r["tail"]}: level {r["deviation_pct"]:.2f} truth {t["recent_level_pct"]:.2f}')
    if len(r["steps"]) != len(t["steps"]): errs.append(f'{r["tail"]} ({t["role"]}, retrofit {t["retrofit"]}): steps {r["steps"]} want {t["steps"]}')
    if t["fan_speed"]:
        e, te = r["engine"], t["engine"]
        if r["thrust_source"]!="fan speed" or e is None: errs.append(f'{r["tail"]}: source {r["thrust_source"]}'); continue
        if e["flags"] != te["expected_flags"]: errs.append(f'{r["tail"]} (engine {te["role"]}): e-flags {e["flags"]} want {te["expected_flags"]}')
        b = abs(e["deviation_pct"]-te["recent_level_pct"]); maxe=max(maxe,b)
        if b>0.5: errs.append(f'{r["tail"]}: engine level {e["deviation_pct"]:.2f} truth {te["recent_level_pct"]:.2f}')
        if len(e["steps"]) != len(te["steps"]): errs.append(f'{r["tail"]}: engine steps {e["steps"]} want {te["steps"]}')
        for s, ts in zip(e["steps"], te["steps"]):
            print(f'  {r["tail"]} engine {te["role"]}: step {s["date"]} {s["size_pct"]:+.2f} vs truth {ts["date"]} {ts["size_pct"]:+.2f}')
    else:
        if r["thrust_source"]!="fuel flow" or r["engine"] is not None: errs.append(f'{r["tail"]}: no N1 but source {r["thrust_source"]} engine {r["engine"]}')
    for s, ts in zip(r["steps"], t["steps"]):
        print(f'  {r["tail"]} airframe {t["role"]}: step {s["date"]} {s["size_pct"]:+.2f} vs truth {ts["date"]} {ts["size_pct"]:+.2f}')
roles = {}
for t in truth["tails"]:
    roles.setdefault(t["role"],0); roles[t["role"]]+=1
    if t["engine"]: roles.setdefault("engine "+t["engine"]["role"],0); roles["engine "+t["engine"]["role"]]+=1
print("roles:", roles, "no N1:", sum(1 for t in truth["tails"] if not t["fan_speed"]), "retrofit:", [(t["tail"], t["retrofit"]) for t in truth["tails"] if t["retrofit"]])
print(f"max |level error| airframe {maxa:.2f} pp, engine {maxe:.2f} pp; flagged {rep['fleet']['flagged']}")
print("ERRORS:" if errs else "all checks pass"); [print(" ", e) for e in errs]
sys.exit(1 if errs else 0)
