#!/usr/bin/python3
"""Check circlet tables against docs/data-files.md (run by tests/data_files.cpp).

Usage: data_files_check.py docs/data-files.md KIND=FILE [KIND=FILE ...] [--fresh]

For each FILE: load it with the one documented call
    pandas.read_csv(path, comment="#", dtype=str, keep_default_na=False),
check that every column is documented for KIND in docs/data-files.md (the
table after "<!-- columns: KIND -->"), that every non-empty cell has the
column's documented type, and that the file starts with a provenance line
(with --fresh: one that names the git commit and the FLINT, Arb and NTL
versions). Prints one line per file; exit status 1 on any failure.
"""
import os
import re
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "scripts"))
import circlet_data as cd  # noqa: E402
import pandas  # noqa: E402


def documented_columns(doc_text):
    """{kind: {column: type}} from the tables after '<!-- columns: KIND -->'."""
    out = {}
    for m in re.finditer(r"<!-- columns: (\S+) -->\n((?:\|.*\n)+)", doc_text):
        kind, table = m.group(1), m.group(2).splitlines()
        cols = {}
        for line in table[2:]:  # header and |---| rule first
            cells = [c.strip() for c in re.split(r"(?<!\\)\|", line)[1:-1]]
            names = re.findall(r"`([^`]+)`", cells[0])
            types = re.findall(r"`([^`]+)`", cells[1])
            if len(types) != 1 or not names:
                raise SystemExit("docs/data-files.md: bad row for %s: %s" % (kind, line))
            for n in names:
                cols[n] = types[0]
        out[kind] = cols
    return out


def is_exact(s):
    try:
        cd.exact(s)
        return True
    except ValueError:
        return False


def is_ball(s):
    if s in ("inf", "[+/- inf]"):
        return True
    if s.startswith("["):
        try:
            b = cd.ball(s)
            return b.mid is not None and "," not in s
        except ValueError:
            return False
    try:
        float(s)
        return True
    except ValueError:
        return False


CHECKS = {
    "integer": lambda s: re.fullmatch(r"-?\d+", s) is not None,
    "rational": lambda s: s == "undefined" or ("[" not in s and is_exact(s)),
    "ball": is_ball,
    "rational-or-ball": lambda s: ("[" not in s and is_exact(s)) or is_ball(s),
    "interval": lambda s: re.fullmatch(r"\[\s*[-+0-9.eE]+\s*,\s*[-+0-9.eE]+\s*\]", s) is not None,
    "decimal": lambda s: re.fullmatch(r"[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?|[-+]?inf|nan", s) is not None,
    "yes/no": lambda s: s in ("yes", "no"),
    "true/false": lambda s: s in ("true", "false"),
    "family": lambda s: re.fullmatch(r"(c|sc|sq)\d+", s) is not None,
    "text": lambda s: True,
}


def main(argv):
    fresh = "--fresh" in argv
    argv = [a for a in argv if a != "--fresh"]
    if len(argv) < 3:
        print(__doc__.strip().splitlines()[2], file=sys.stderr)
        return 2
    with open(argv[1], encoding="utf-8") as f:
        docs = documented_columns(f.read())
    failed = 0
    for arg in argv[2:]:
        kind, path = arg.split("=", 1)
        problems = []
        if kind not in docs:
            problems.append("kind %s is not documented" % kind)
        df = pandas.read_csv(path, comment="#", dtype=str, keep_default_na=False)
        cols = docs.get(kind, {})
        for c in df.columns:
            if c not in cols:
                problems.append("column %s is not documented for %s" % (c, kind))
                continue
            check = CHECKS[cols[c]]
            bad = [v for v in df[c] if v != "" and not check(v)]
            if bad:
                problems.append("column %s (%s): %d cells of another type, e.g. %r" % (c, cols[c], len(bad), bad[0]))
        if len(df) == 0:
            problems.append("no rows")
        prov = cd.provenance(path)
        if prov.get("program") != "circlet" or not prov.get("command", "").startswith("circlet "):
            problems.append("no provenance line")
        elif fresh:
            for key in ("git", "flint", "arb", "ntl"):
                if not prov.get(key):
                    problems.append("provenance has no %s field" % key)
        if problems:
            failed += 1
            print("FAIL %s %s: %s" % (kind, path, "; ".join(problems)))
        else:
            print("ok   %s %s: %d rows, columns %s" % (kind, path, len(df), ",".join(df.columns)))
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
