#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Run a command and report the peak of the summed resident memory of it and all its descendants
(tollgate and its parser processes), and its CPU time (user + system of it and every descendant
it waited for), polling /proc every 50 ms (a peak shorter than that can be missed). The resident
sum counts pages the processes share (libclang's code, say) once per process; the proportional
sum (Pss of /proc/PID/smaps_rollup, each shared page split among its sharers) is what the tree
takes from the machine.
Usage: tree_peak.py OUT_FILE COMMAND [ARGS...]; OUT_FILE gets
"PEAK_RSS_MIB CPU_SECONDS PEAK_PSS_MIB"."""
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


def tree_kib(root):
    """Return the summed resident and proportional memory of `root` and its descendants, in KiB."""
    kids = children_map()
    rss, pss, todo = 0, 0, [root]
    while todo:
        pid = todo.pop()
        todo += kids.get(pid, [])
        try:
            with open(f"/proc/{pid}/status") as f:
                for line in f:
                    if line.startswith("VmRSS:"):
                        rss += int(line.split()[1])
            with open(f"/proc/{pid}/smaps_rollup") as f:
                for line in f:
                    if line.startswith("Pss:"):
                        pss += int(line.split()[1])
        except OSError:
            pass
    return rss, pss


def main():
    out, command = sys.argv[1], sys.argv[2:]
    process = subprocess.Popen(command)
    peak, peak_pss = 0, 0
    while process.poll() is None:
        rss, pss = tree_kib(process.pid)
        peak, peak_pss = max(peak, rss), max(peak_pss, pss)
        time.sleep(0.05)
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    with open(out, "w") as f:
        f.write(f"{peak / 1024:.1f} {usage.ru_utime + usage.ru_stime:.2f} {peak_pss / 1024:.1f}\n")
    sys.exit(process.returncode)


if __name__ == "__main__":
    main()
