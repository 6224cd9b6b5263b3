#!/usr/bin/python3
"""Reading what circlet writes: tables, provenance, exact numbers and balls.

Every CSV table circlet writes (`-o FILE.csv`, or standard output) loads into
pandas with one call (docs/data-files.md):

    import pandas
    df = pandas.read_csv(path, comment="#", dtype=str, keep_default_na=False)

(`circlet_data.READ_CSV` holds these keyword arguments.) Every cell is then a
string, exactly as written: exact integers of any size, rationals "p/q", Arb
balls "[m +/- r]", intervals "[lo, hi]", "yes"/"no", or "" for no value. This
module turns them into Python values:

    exact(s)     -> int or fractions.Fraction ("p/q", "m*2^e"), None for ""
    ball(s)      -> Ball(mid, rad) in double precision, for display
    to_float(s)  -> float for plotting (exact values and ball midpoints)
    read_table(path) -> (pandas.DataFrame of strings, provenance dict)
    provenance(path) -> dict: program, version, command, date, and the rest

Numbers converted to double precision are for display only: the rigorous
content is the string (an exact value, or a ball that contains the true value).
"""
import csv
import io
import json
import math
import re
from collections import namedtuple
from fractions import Fraction

READ_CSV = {"comment": "#", "dtype": str, "keep_default_na": False}


# ------------------------------------------------------------- provenance --

_PROV_RE = re.compile(r"^#\s*(\S+)\s+(\S+)\s*\|\s*(.*?)\s*\|\s*(\S+)\s*(?:\|\s*(.*))?$")


def parse_provenance_line(line):
    """'# circlet 0.1.0 | circlet count c7 --to 5 | 2026-...Z | prec 128 bits' -> dict.

    Fields after the date ("prec 128 bits", "git 1a2b3c4", "flint 3.0.1", ...) go
    into the dict by their first word; the whole tail is kept under "extra"."""
    m = _PROV_RE.match(line.strip())
    if not m:
        return {"program": "circlet", "version": "?", "command": line.lstrip("# ").strip(), "date": ""}
    p = {"program": m.group(1), "version": m.group(2), "command": m.group(3), "date": m.group(4)}
    extra = (m.group(5) or "").strip()
    if extra:
        p["extra"] = extra
        for field in extra.split("|"):
            for part in field.split(","):
                words = part.split()
                if len(words) >= 2 and words[0] not in p:
                    p[words[0]] = " ".join(words[1:])
    return p


def provenance(path):
    """The provenance of a circlet file: its first '# circlet ...' line, or the JSON "provenance"."""
    with open(path, encoding="utf-8") as fh:
        text = fh.read()
    if text.lstrip()[:1] in ("{", "["):
        obj = json.loads(text)
        return obj.get("provenance", {}) if isinstance(obj, dict) else {}
    for line in text.splitlines():
        if line.startswith("#"):
            return parse_provenance_line(line)
        if line.strip():
            break
    return {}


def command_name(prov):
    """The circlet subcommand recorded in a provenance dict ('ratio', 'count', ...), or None."""
    toks = (prov or {}).get("command", "").split()
    for i, t in enumerate(toks):
        if t.endswith("circlet") and i + 1 < len(toks):
            return toks[i + 1]
    return None


# ---------------------------------------------------------------- numbers --

Ball = namedtuple("Ball", "mid rad")
Ball.lo = property(lambda b: b.mid - b.rad)
Ball.hi = property(lambda b: b.mid + b.rad)

_BALL_RE = re.compile(r"^\s*\[\s*([^\s\]]+)\s*\+/-\s*([^\s\]]+)\s*\]\s*$")
_INTERVAL_RE = re.compile(r"^\s*\[\s*([^\s,\]]+)\s*,\s*([^\s,\]]+)\s*\]\s*$")
_EXP2_RE = re.compile(r"^\s*(-?\d+)\*2\^(-?\d+)\s*$")
_INT_RE = re.compile(r"^\s*[-+]?\d+\s*$")
_RAT_RE = re.compile(r"^\s*[-+]?\d+\s*/\s*\d+\s*$")
_UNDEFINED = ("", "undefined", "nan", "none", "null", "-", "unknown")


def exact(s):
    """An exact value: int for '123', Fraction for 'p/q' or 'm*2^e'; None for '' or 'undefined'.

    Raises ValueError for anything that is not exact (a ball, a decimal)."""
    if s is None:
        return None
    if isinstance(s, bool):
        raise ValueError("not an exact number: %r" % (s,))
    if isinstance(s, int):
        return s
    t = str(s).strip()
    if t.lower() in _UNDEFINED:
        return None
    if _INT_RE.match(t):
        return int(t)
    if _RAT_RE.match(t):
        return Fraction(t.replace(" ", ""))
    m = _EXP2_RE.match(t)
    if m:
        return Fraction(int(m.group(1))) * Fraction(2) ** int(m.group(2))
    raise ValueError("not an exact number: %r" % (s,))


def _fraction_to_float(q):
    try:
        return float(q)
    except OverflowError:
        return math.inf if q > 0 else -math.inf


def to_float(x):
    """Display value of an exact integer, rational, 'm*2^e', ball or decimal; None if undefined."""
    if x is None:
        return None
    if isinstance(x, bool):
        return float(x)
    if isinstance(x, (int, Fraction)):
        return _fraction_to_float(Fraction(x))
    if isinstance(x, float):
        return x
    if isinstance(x, dict):
        return ball(x).mid
    s = str(x).strip()
    if s.lower() in _UNDEFINED:
        return None
    if s.lower() in ("inf", "+inf"):
        return math.inf
    if s.startswith("["):
        return ball(s).mid
    try:
        return _fraction_to_float(Fraction(exact(s)))
    except ValueError:
        pass
    try:
        return float(s)
    except ValueError:
        return None


def ball(x):
    """Ball(mid, rad) as doubles from '[m +/- r]', '[+/- r]', '[x]', '[lo, hi]', an exact value,
    a decimal, or a certificate's {"mid": "m*2^e", "rad": "m*2^e"} (also {"ball", "exact"},
    {"decimal"}, {"lo", "hi"}). An undefined value gives Ball(None, None)."""
    if isinstance(x, dict):
        if "mid" in x and "rad" in x:
            try:
                return Ball(_fraction_to_float(exact(x["mid"])), _fraction_to_float(exact(x["rad"])))
            except (ValueError, TypeError):
                return Ball(to_float(x["mid"]), to_float(x["rad"]) or 0.0)
        if "ball" in x:
            if x.get("exact"):
                v = to_float(x["exact"])
                if v is not None:
                    return Ball(v, 0.0)
            return ball(x["ball"])
        if "decimal" in x:
            return ball(x["decimal"])
        if "lo" in x and "hi" in x:
            lo, hi = to_float(x["lo"]), to_float(x["hi"])
            return Ball((lo + hi) / 2, (hi - lo) / 2)
        raise ValueError("not a ball: %r" % (x,))
    if x is None:
        return Ball(None, None)
    s = str(x).strip()
    m = _BALL_RE.match(s)
    if m:
        return Ball(float(m.group(1)), float(m.group(2)))
    m = re.match(r"^\[\s*\+/-\s*([^\s\]]+)\s*\]$", s)  # "[+/- r]": midpoint 0
    if m:
        return Ball(0.0, float(m.group(1)))
    m = _INTERVAL_RE.match(s)
    if m:
        lo, hi = float(m.group(1)), float(m.group(2))
        return Ball((lo + hi) / 2, (hi - lo) / 2)
    if s.startswith("[") and s.endswith("]"):  # an exact ball "[3.25]"
        return Ball(float(s[1:-1]), 0.0)
    v = to_float(s)
    return Ball(v, 0.0 if v is not None else None)


# ----------------------------------------------------------------- tables --

class Table:
    """Rows of one command's output, with its provenance and JSON metadata."""

    def __init__(self, columns, rows, provenance, meta, path):
        self.columns = list(columns)
        self.rows = rows  # list of lists of str / numbers, as read
        self.provenance = provenance  # dict: program, version, command, date, ...
        self.meta = meta  # the whole JSON object (empty for CSV)
        self.path = path

    def has(self, *names):
        return any(n in self.columns for n in names)

    def col(self, *names):
        """The first of `names` that is a column, as a list of raw values."""
        for n in names:
            if n in self.columns:
                i = self.columns.index(n)
                return [r[i] for r in self.rows]
        raise KeyError("%s: none of the columns %s (columns are %s)" % (self.path, ", ".join(names),
                                                                        ", ".join(self.columns)))

    def find(self, *names):
        for n in names:
            if n in self.columns:
                return n
        return None

    def command(self):
        return command_name(self.provenance)

    def __len__(self):
        return len(self.rows)

    def to_pandas(self):
        import pandas as pd
        return pd.DataFrame(self.rows, columns=self.columns)


def _find_rows(obj):
    """Locate the table inside a JSON document: {columns, rows} or a list of objects."""
    if isinstance(obj, dict):
        if "columns" in obj and "rows" in obj:
            return obj["columns"], obj["rows"]
        for key in ("rows", "table", "points", "terms", "arcs", "values", "pairs", "results", "data"):
            v = obj.get(key)
            if isinstance(v, list) and v and isinstance(v[0], dict):
                cols = list(v[0].keys())
                return cols, [[r.get(c) for c in cols] for r in v]
    if isinstance(obj, list) and obj and isinstance(obj[0], dict):
        cols = list(obj[0].keys())
        return cols, [[r.get(c) for c in cols] for r in obj]
    return [], []


def load_table(path):
    """Read a circlet CSV (with its '# circlet ...' line) or a circlet JSON file into a Table."""
    with open(path, encoding="utf-8") as fh:
        text = fh.read()
    if text.lstrip()[:1] in ("{", "["):
        obj = json.loads(text)
        cols, rows = _find_rows(obj)
        prov = obj.get("provenance", {}) if isinstance(obj, dict) else {}
        return Table(cols, rows, prov, obj if isinstance(obj, dict) else {}, path)
    prov = {}
    lines = []
    for line in io.StringIO(text):
        if line.startswith("#"):
            if not prov:
                prov = parse_provenance_line(line)
            continue
        if line.strip():
            lines.append(line)
    reader = csv.reader(lines)
    header = next(reader, None)
    if header is None:
        raise ValueError("%s: no CSV header line" % path)
    rows = [r for r in reader]
    return Table([h.strip() for h in header], rows, prov, {}, path)


def read_table(path):
    """(pandas.DataFrame with every cell a string, provenance dict) for a circlet CSV file."""
    import pandas as pd
    return pd.read_csv(path, **READ_CSV), provenance(path)


def exact_column(series):
    """A pandas column of exact values (int / Fraction / None), e.g. df["count"]."""
    return series.map(exact)


def float_column(series):
    """A pandas column as floats for plotting (exact values and ball midpoints; NaN if undefined)."""
    return series.map(lambda s: to_float(s) if to_float(s) is not None else math.nan).astype(float)
