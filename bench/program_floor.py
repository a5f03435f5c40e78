#!/usr/bin/env python3
"""Floor pass for bench/program.bench.ts: read every visibility of a bundle and multiply it by a
gain product g[ant1] * conj(g[ant2]), chunk by chunk. Prints the elapsed seconds as JSON."""
import json
import sys
import time

import numpy as np

start = time.perf_counter()
with np.load(sys.argv[1], allow_pickle=False) as bundle:
    vis = bundle["vis"]
    ant1 = bundle["ant1"]
    ant2 = bundle["ant2"]
    n_ant = len(bundle["antenna_name"])
gain = (np.ones((n_ant, vis.shape[2])) * np.exp(0.1j)).astype(np.complex64)
step = max(1, (1 << 19) // (vis.shape[1] * vis.shape[2]))
for s in range(0, vis.shape[0], step):
    rows = slice(s, s + step)
    product = gain[ant1[rows]] * np.conj(gain[ant2[rows]])
    block = vis[rows]
    for k in range(vis.shape[2]):  # per correlation: the fast way to broadcast along channels
        view = block[:, :, k]
        view *= product[:, k, None]
print(json.dumps({"seconds": time.perf_counter() - start}))
