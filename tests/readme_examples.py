#!/usr/bin/env python3
"""Every README example prints exactly what the README shows.

Usage: tests/readme_examples.py README.md build/circlet

Each ```console block of README.md is a list of examples: a line "$ COMMAND"
followed by the output shown for it (up to the next "$ " line or the end of the
block). The command is run by /bin/sh in a scratch directory with
"build/circlet" replaced by the binary under test; the expected output is
compared byte for byte with the command's standard output followed by its
standard error (a command that redirects its standard output to a file shows
only standard error). Exit status 0 when every example matches, 1 otherwise
(with a unified diff of each mismatch), 2 for bad usage or no examples.

One thing differs from run to run and is masked on both sides before the
comparison: in a "# circlet ..." provenance line (docs/data-files.md), the
date of the run and the git commit of the build become DATE and COMMIT.
Everything else, including the rest of that line, must match byte for byte.
"""
import difflib
import os
import re
import subprocess
import sys
import tempfile


def examples(readme_text):
    """Yield (line number, command, expected output) for every console example."""
    lines = readme_text.split("\n")
    i = 0
    while i < len(lines):
        if lines[i].strip() == "```console":
            block = []
            start = i + 1
            i += 1
            while i < len(lines) and lines[i].strip() != "```":
                block.append((i + 1, lines[i]))
                i += 1
            cur = None
            for lineno, text in block:
                if text.startswith("$ "):
                    if cur:
                        yield cur[0], cur[1], "".join(l + "\n" for l in cur[2])
                    cur = (lineno, text[2:], [])
                elif cur is not None:
                    cur[2].append(text)
                else:
                    raise SystemExit(f"README line {lineno}: console block (from line {start}) "
                                     "does not start with a '$ ' command")
            if cur:
                yield cur[0], cur[1], "".join(l + "\n" for l in cur[2])
        i += 1


_PROV_DATE = re.compile(r"\| \d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ \|")
_PROV_GIT = re.compile(r"\| git [0-9a-f]{7,40}\b|\| git unknown\b")


def mask(text):
    """The output with the date and commit of every provenance line replaced (see above)."""
    out = []
    for line in text.split("\n"):
        if line.startswith("# circlet "):
            line = _PROV_GIT.sub("| git COMMIT", _PROV_DATE.sub("| DATE |", line))
        out.append(line)
    return "\n".join(out)


def main(argv):
    if len(argv) != 3:
        print(__doc__.strip().split("\n")[2], file=sys.stderr)
        return 2
    readme, binary = argv[1], os.path.abspath(argv[2])
    with open(readme, encoding="utf-8") as f:
        cases = list(examples(f.read()))
    if not cases:
        print(f"{readme}: no ```console examples found", file=sys.stderr)
        return 2
    failed = 0
    with tempfile.TemporaryDirectory() as scratch:
        for lineno, command, expected in cases:
            cmd = re.sub(r"(^|\s)build/circlet(?=\s|$)", lambda m: m.group(1) + binary, command)
            run = subprocess.run(["/bin/sh", "-c", cmd], cwd=scratch, capture_output=True)
            got = run.stdout.decode("utf-8", "replace") + run.stderr.decode("utf-8", "replace")
            if mask(got) == mask(expected) and run.returncode == 0:
                print(f"ok    README:{lineno}  $ {command}")
                continue
            failed += 1
            print(f"FAIL  README:{lineno}  $ {command}  (exit status {run.returncode})")
            sys.stdout.writelines(difflib.unified_diff(
                mask(expected).splitlines(True), mask(got).splitlines(True), "README (shown)", "program (printed)"))
    print(f"{len(cases) - failed} of {len(cases)} README examples match byte for byte")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
