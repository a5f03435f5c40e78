#!/usr/bin/env python3
"""Runs a command and prints its wall time and peak resident memory (children's ru_maxrss) as JSON.

  python3 program_measure.py CMD [ARGS...]
"""
import json
import resource
import subprocess
import sys
import time

start = time.perf_counter()
done = subprocess.run(sys.argv[1:], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
elapsed = time.perf_counter() - start
usage = resource.getrusage(resource.RUSAGE_CHILDREN)
print(json.dumps({"seconds": elapsed, "max_rss_kb": usage.ru_maxrss, "status": done.returncode, "stderr": done.stderr[-2000:], "stdout": done.stdout[-4000:]}))
