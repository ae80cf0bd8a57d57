#!/usr/bin/env python3
"""Seeded random search for invented rank-5 sums with non-zero cubic matter couplings on the codimension-2
configuration P1^5[(1,1,1,1,2);(1,1,1,1,0)] (how the sums of the test
`codimension_two_sums_have_non_zero_cubic_matter_couplings` in tests/cli_couplings.rs were found: seed 11).

Draws four degree vectors with entries in [-2, 2], completes them to c1 = 0 (last entries in [-3, 3]), runs
`sheafwright couplings --json` and prints every sum whose `10 10 5` or `5bar 10 5bar` textures have an entry
with an exact non-zero value. Stops after three hits or LIMIT seconds.

Usage: cargo build --release && benches/search_codim2_couplings.py [SEED] [LIMIT_SECONDS]
"""
import json
import os
import random
import subprocess
import sys
import time

seed = int(sys.argv[1]) if len(sys.argv) > 1 else 11
limit = float(sys.argv[2]) if len(sys.argv) > 2 else 600
rng = random.Random(seed)
binary = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "target", "release", "sheafwright")
t0 = time.time()
tried = hits = 0
while time.time() - t0 < limit:
    bs = [[rng.randint(-2, 2) for _ in range(5)] for _ in range(4)]
    last = [-sum(b[i] for b in bs) for i in range(5)]
    if any(abs(x) > 3 for x in last):
        continue
    bs.append(last)
    arg = ";".join(",".join(map(str, b)) for b in bs)
    tried += 1
    try:
        out = subprocess.run([binary, "couplings", "--ambient", "1,1,1,1,1", "--equations", "1,1,1,1,2;1,1,1,1,0",
                              "--bundles", arg, "--json"], capture_output=True, text=True, timeout=30)
    except subprocess.TimeoutExpired:
        continue
    if out.returncode != 0:
        continue
    d = json.loads(out.stdout)
    vals = [(c["operator"], e["fields"], e.get("value"), e.get("types")) for c in d["classes"] for e in c["entries"]
            if c["operator"] in ("10 10 5", "5bar 10 5bar") and e.get("value") not in (None, "0")]
    if vals:
        hits += 1
        print("FOUND", arg, len(vals), vals[:2], flush=True)
        if hits >= 3:
            break
print("tried", tried, "in", round(time.time() - t0, 1), "s", flush=True)
