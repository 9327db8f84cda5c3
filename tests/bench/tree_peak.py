#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Run a command and report the peak of the summed resident memory of it and all its descendants
(tollgate and its parser processes), and its CPU time (user + system of it and every descendant
it waited for), polling /proc every 50 ms (a peak shorter than that can be missed).
Usage: tree_peak.py OUT_FILE COMMAND [ARGS...]; OUT_FILE gets "PEAK_MIB CPU_SECONDS"."""
import os
import resource
import subprocess
import sys
import time


def children_map():
    kids = {}
    for name in os.listdir("/proc"):
        if not name.isdigit():
            continue
        try:
            with open(f"/proc/{name}/stat") as f:
                fields = f.read().rsplit(")", 1)[1].split()
            kids.setdefault(int(fields[1]), []).append(int(name))
        except OSError:
            pass
    return kids


def tree_rss_kib(root):
    kids = children_map()
    total, todo = 0, [root]
    while todo:
        pid = todo.pop()
        todo += kids.get(pid, [])
        try:
            with open(f"/proc/{pid}/status") as f:
                for line in f:
                    if line.startswith("VmRSS:"):
                        total += int(line.split()[1])
        except OSError:
            pass
    return total


def main():
    out, command = sys.argv[1], sys.argv[2:]
    process = subprocess.Popen(command)
    peak = 0
    while process.poll() is None:
        peak = max(peak, tree_rss_kib(process.pid))
        time.sleep(0.05)
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    with open(out, "w") as f:
        f.write(f"{peak / 1024:.1f} {usage.ru_utime + usage.ru_stime:.2f}\n")
    sys.exit(process.returncode)


if __name__ == "__main__":
    main()
