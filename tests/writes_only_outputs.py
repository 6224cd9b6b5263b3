#!/usr/bin/python3
"""Every circlet command writes only where it was told to.

Runs one example of each command under strace (file-creating and file-changing
system calls only) with the working directory and TMPDIR inside a scratch
directory, and fails when any file is opened for writing, created, renamed,
removed or made outside the command's output path and TMPDIR, or when
anything is left behind in TMPDIR (the factoring child of `main` works in a
private mkdtemp directory there and must remove it).

Usage: writes_only_outputs.py path/to/circlet
Exit 0 pass, 1 fail, 77 skipped (strace missing: ctest reports it as skipped).
"""
import os
import re
import shutil
import subprocess
import sys
import tempfile

WRITE_CALL = re.compile(r'^\d+\s+(openat|open|creat|rename|renameat2?|mkdir|mkdirat|unlink|unlinkat|link|symlink|truncate)\((.*)$')
PATHS = re.compile(r'"((?:[^"\\]|\\.)*)"')
ALWAYS_ALLOWED = ("/dev/null", "/dev/tty")


def writes(line):
    """The paths a traced call writes, or [] for a read-only open / failed call."""
    m = WRITE_CALL.match(line)
    if not m or re.search(r"= -1 ", line):
        return []
    call, rest = m.group(1), m.group(2)
    if call in ("openat", "open") and not re.search(r"O_WRONLY|O_RDWR|O_CREAT|O_TRUNC", rest):
        return []
    return PATHS.findall(rest)


def main():
    if len(sys.argv) != 2:
        print(__doc__)
        return 2
    circlet = os.path.abspath(sys.argv[1])
    strace = shutil.which("strace")
    if not strace:
        print("SKIP: strace is not installed (scripts/setup.sh installs it)")
        return 77
    if subprocess.run([strace, "-qq", "-o", os.devnull, "true"]).returncode != 0:
        print("SKIP: strace cannot trace here (ptrace not permitted)")
        return 77
    scratch = tempfile.mkdtemp(prefix="circlet-writes-")
    out = os.path.join(scratch, "out")
    tmp = os.path.join(scratch, "tmp")
    cwd = os.path.join(scratch, "cwd")
    for d in (out, tmp, cwd):
        os.mkdir(d)
    os.chmod(cwd, 0o555)  # nothing may be written into the working directory either
    env = dict(os.environ, TMPDIR=tmp)
    cases = [
        ["count", "c7", "--to", "2000", "-o", f"{out}/count.csv"],
        ["--allow-large", "main", "c6", "--at", "10^40+7", "--factor-timeout", "2"],
        ["main", "c7", "--to", "300", "-o", f"{out}/main.csv"],
        ["arcs", "c9", "--at", "1000", "--upto", "8", "-o", f"{out}/arcs.csv"],
        ["--allow-large", "arcs", "c6", "--at", "10^40+7", "--upto", "2", "-o", f"{out}/arcs-big.csv"],
        ["remainder", "c9", "--to", "200", "-o", f"{out}/rem.csv"],
        ["ratio", "c7", "sc13", "--ap", "2,1", "--ap2", "3,1", "--to", "20", "-o", f"{out}/ratio.csv"],
        ["certify", "c7", "sc13", "--ap", "2,1", "--ap2", "3,1", "-o", f"{out}/cert.json"],
        ["verify", f"{out}/cert.json"],
        ["prove", "c5(5n+4) == 0 mod 5", "-o", f"{out}/proof.json"],
        ["verify", f"{out}/proof.json"],
        ["scan", "--t", "6..7", "--modulus", "3", "--verify", "-o", f"{out}/scan"],
        ["scan", "--t", "4..4", "--modulus", "2", "-o", f"{out}/scan45"],
    ]
    failures = []
    for args in cases:
        trace = os.path.join(scratch, "trace.txt")
        cmd = [strace, "-f", "-qq", "-o", trace, "-e",
               "trace=chdir,clone,clone3,fork,vfork,open,openat,creat,rename,renameat,renameat2,mkdir,mkdirat,unlink,unlinkat,link,symlink,truncate",
               circlet] + args
        r = subprocess.run(cmd, cwd=cwd, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True, timeout=600)
        if r.returncode != 0:
            failures.append(f"circlet {' '.join(args)}: exit {r.returncode}: {r.stderr.strip()[-300:]}")
            continue
        dirs = {}  # pid -> working directory (relative paths are resolved against it)
        with open(trace) as f:
            for line in f:
                pid = line.split(None, 1)[0]
                here = dirs.setdefault(pid, cwd)
                m = re.match(r"^\d+\s+(?:clone3?|fork|vfork)\(.*= (\d+)$", line.strip())
                if m:
                    dirs[m.group(1)] = here
                m = re.match(r'^\d+\s+chdir\("((?:[^"\\]|\\.)*)"\) = 0', line)
                if m:
                    dirs[pid] = os.path.normpath(os.path.join(here, m.group(1)))
                for p in writes(line):
                    full = os.path.normpath(os.path.join(here, p))
                    if full in ALWAYS_ALLOWED or full.startswith(out + "/") or full == out or full.startswith(tmp + "/"):
                        continue
                    failures.append(f"circlet {' '.join(args)}: writes {full}: {line.strip()[:200]}")
        left = os.listdir(tmp)
        if left:
            failures.append(f"circlet {' '.join(args)}: left {left} in TMPDIR")
        print(f"ok   circlet {' '.join(args)}")
    os.chmod(cwd, 0o755)
    shutil.rmtree(scratch)
    for f in failures:
        print("FAIL", f)
    print(f"{len(cases)} commands, {len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
