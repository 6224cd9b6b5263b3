#!/usr/bin/python3
"""Standard pictures of circlet output (matplotlib, Agg backend).

    scripts/plot.py ratio     RATIO.csv|RATIO.json [--cert CERT.json] -o FILE.png|FILE.svg
    scripts/plot.py remainder REMAINDER.csv|.json                     -o FILE.png|FILE.svg
    scripts/plot.py arcs      ARCS.csv|ARCS.json [--main MAIN.json]   -o FILE.png|FILE.svg

The input is what `circlet ratio`, `circlet remainder` and `circlet arcs`
write: a CSV file that starts with the `# circlet VERSION | COMMAND | DATE`
provenance line (the commands' `-o FILE`), or their `--json` output. A
certificate (`circlet certify -o CERT.json`) adds the certified limit band
(CONSTANT) or the two disjoint non-convergence bands (NON-CONVERGENT) to a
ratio plot.

Every figure is FIGSIZE inches at DPI dots per inch, so a PNG is exactly
PIXELS = (800, 600) pixels; the SVG keeps its text as text (svg.fonttype
none) and names each axis label in an XML comment, so a test can find it.
The title states family, progression and range; the caption line gives the
program version, command and date from the provenance of the input.

Numbers here are for display only: balls are drawn from their decimal or
midpoint/radius form in double precision; nothing a picture shows is a bound
that is not already certified in the input it was drawn from.

This file is also a small library for the notebooks (load_table, parse_ball,
family_tex, plot_ratio, plot_remainder, plot_arcs).
"""
import argparse
import csv
import io
import json
import math
import os
import re
import shlex
import sys
import textwrap
from fractions import Fraction

import matplotlib

if "ipykernel" not in sys.modules:  # notebooks keep their inline backend; files are the same
    matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
from matplotlib.ticker import MaxNLocator  # noqa: E402

FIGSIZE = (8.0, 6.0)  # inches
DPI = 100
PIXELS = (int(FIGSIZE[0] * DPI), int(FIGSIZE[1] * DPI))

plt.rcParams.update({
    "svg.fonttype": "none",  # text stays text in the SVG
    "svg.hashsalt": "circlet",  # stable ids, so re-running gives the same SVG
    "font.size": 10,
    "axes.grid": True,
    "grid.alpha": 0.3,
})


# ---------------------------------------------------------------- reading --

class Table:
    """Rows of one command's output, with its provenance and JSON metadata."""

    def __init__(self, columns, rows, provenance, meta, path):
        self.columns = list(columns)
        self.rows = rows  # list of lists of str / numbers, as read
        self.provenance = provenance  # dict: program, version, command, date
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

    def __len__(self):
        return len(self.rows)

    def to_pandas(self):
        import pandas as pd
        return pd.DataFrame(self.rows, columns=self.columns)


_PROV_RE = re.compile(r"^#\s*(\S+)\s+(\S+)\s*\|\s*(.*?)\s*\|\s*(\S+)(?:\s*\|.*)?$")


def parse_provenance_line(line):
    """'# circlet 0.1.0 | circlet count c7 --to 5 | 2026-...Z' -> dict."""
    m = _PROV_RE.match(line.strip())
    if not m:
        return {"program": "circlet", "version": "?", "command": line.lstrip("# ").strip(), "date": ""}
    return {"program": m.group(1), "version": m.group(2), "command": m.group(3), "date": m.group(4)}


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
    """Read a circlet CSV (with its '# circlet ...' line) or a circlet JSON file."""
    with open(path, encoding="utf-8") as fh:
        text = fh.read()
    if text.lstrip().startswith("{") or text.lstrip().startswith("["):
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


def load_json(path):
    with open(path, encoding="utf-8") as fh:
        return json.load(fh)


# ---------------------------------------------------------------- numbers --

_BALL_RE = re.compile(r"^\s*\[\s*([^\s\]]+)\s*\+/-\s*([^\s\]]+)\s*\]\s*$")
_EXP2_RE = re.compile(r"^\s*(-?\d+)\*2\^(-?\d+)\s*$")


def to_float(x):
    """Display value of an exact integer, rational 'p/q', 'm*2^e' or decimal; None if undefined."""
    if x is None:
        return None
    if isinstance(x, bool):
        return float(x)
    if isinstance(x, (int, float)):
        try:
            return float(x)
        except OverflowError:
            return math.inf if x > 0 else -math.inf
    if isinstance(x, dict):
        return parse_ball(x)[0]
    s = str(x).strip()
    if s == "" or s.lower() in ("undefined", "nan", "none", "null", "-", "unknown", "inf"):
        return None
    if s.startswith("["):
        return parse_ball(s)[0]
    m = _EXP2_RE.match(s)
    if m:
        return _exp2_to_float(int(m.group(1)), int(m.group(2)))
    try:
        if "/" in s:
            return float(Fraction(s))
        if re.fullmatch(r"-?\d+", s):
            try:
                return float(int(s))
            except OverflowError:
                return math.inf if not s.startswith("-") else -math.inf
        return float(s)
    except (ValueError, ZeroDivisionError, OverflowError):
        return None


def _exp2_to_float(m, e):
    try:
        return float(Fraction(m) * (Fraction(2) ** e))
    except OverflowError:
        return math.inf if m > 0 else -math.inf


def parse_ball(x):
    """(mid, rad) as doubles from '[m +/- r]', {'mid','rad'} (m*2^e strings), {'decimal'}, or a number."""
    if isinstance(x, dict):
        if "mid" in x and "rad" in x:
            mid, rad = x["mid"], x["rad"]
            mm = _EXP2_RE.match(str(mid))
            rm = _EXP2_RE.match(str(rad))
            if mm and rm:
                return (_exp2_to_float(int(mm.group(1)), int(mm.group(2))),
                        _exp2_to_float(int(rm.group(1)), int(rm.group(2))))
            return to_float(mid), to_float(rad) or 0.0
        if "ball" in x:  # {"ball": "[m +/- r]", "exact": "p/q"}: prefer the exact value
            if x.get("exact"):
                v = to_float(x["exact"])
                if v is not None:
                    return v, 0.0
            return parse_ball(x["ball"])
        if "decimal" in x:
            return parse_ball(x["decimal"])
        if "lo" in x and "hi" in x:
            lo, hi = to_float(x["lo"]), to_float(x["hi"])
            return (lo + hi) / 2, (hi - lo) / 2
        raise ValueError("not a ball: %r" % (x,))
    s = str(x).strip()
    m = _BALL_RE.match(s)
    if m:
        return float(m.group(1)), float(m.group(2))
    m = re.match(r"^\[\s*\+/-\s*([^\s\]]+)\s*\]$", s)  # "[+/- r]": midpoint 0
    if m:
        return 0.0, float(m.group(1))
    if s.startswith("[") and s.endswith("]"):  # an exact ball "[3.25]"
        return float(s[1:-1]), 0.0
    v = to_float(s)
    return v, 0.0


def floats(values):
    return [to_float(v) for v in values]


# ---------------------------------------------------------- families, text --

_FAMILY_RE = re.compile(r"^(c|sc|sq)(\d+)$")


def family_parts(name):
    m = _FAMILY_RE.match(str(name))
    if not m:
        return None, None
    return m.group(1), int(m.group(2))


def family_tex(name, arg="n"):
    """'c7' -> 'c_{7}(n)', 'sc13' -> '\\mathrm{sc}_{13}(n)', 'sq5' -> 'r_{5}(n)' (mathtext, no $)."""
    kind, t = family_parts(name)
    head = {"c": "c_{%d}", "sc": r"\mathrm{sc}_{%d}", "sq": "r_{%d}"}.get(kind, r"\mathrm{%s}")
    head = head % (t,) if kind else head % (name,)
    return "%s(%s)" % (head, arg)


def family_rank(name):
    """Rank r of the quadratic form (docs/MATH.md §2): t−1, ⌊t/2⌋, S."""
    kind, t = family_parts(name)
    return {"c": lambda: t - 1, "sc": lambda: t // 2, "sq": lambda: t}[kind]()


def family_shift(name):
    """Δ with X = n + Δ (docs/MATH.md §2 table), exact."""
    kind, t = family_parts(name)
    if kind == "c":
        return Fraction(t * t - 1, 24)
    if kind == "sc":
        m = t // 2
        return Fraction(m * (m + 1), 6) if t % 2 else Fraction(t * t - 1, 24)
    return Fraction(0)


def weight_tex(r):
    return "%d" % (r // 2) if r % 2 == 0 else r"%d/2" % r


def progression_tex(A, B, var="n"):
    A, B = int(A), int(B)
    s = var if A == 1 else "%d%s" % (A, var)
    return s if B == 0 else "%s+%d" % (s, B)


def command_options(command):
    """Positional arguments and --options of a recorded command line."""
    try:
        toks = shlex.split(command or "")
    except ValueError:
        toks = (command or "").split()
    pos, opts = [], {}
    i = 0
    while i < len(toks):
        t = toks[i]
        if t.startswith("-") and not re.fullmatch(r"-\d+", t):
            if "=" in t:
                k, v = t.split("=", 1)
                opts[k] = v
            elif i + 1 < len(toks) and not toks[i + 1].startswith("--"):
                opts[t] = toks[i + 1]
                i += 1
            else:
                opts[t] = True
        else:
            pos.append(t)
        i += 1
    return pos, opts


def _ap(text):
    if not text or text is True:
        return 1, 0
    if isinstance(text, dict):
        return int(text.get("A", 1)), int(text.get("B", 0))
    a, b = str(text).split(",")
    return int(a), int(b)


def caption(fig, *provs):
    lines = []
    for p in provs:
        if not p:
            continue
        line = "%s %s  |  %s  |  %s" % (p.get("program", "circlet"), p.get("version", "?"), p.get("command", "?"),
                                         p.get("date", ""))
        # Wrap long commands so the whole provenance stays inside the fixed-size figure.
        lines.extend(textwrap.wrap(line, width=128, subsequent_indent="    ", break_on_hyphens=False))
    text = "\n".join(lines)
    fig.text(0.01, 0.005, text, fontsize=7, family="monospace", ha="left", va="bottom", color="0.3",
             gid="caption")
    return text


def _label(ax, xlabel, ylabel):
    """Axis labels in mathtext; the SVG gets them as XML comments (backend_svg) and as gids."""
    ax.xaxis.set_major_locator(MaxNLocator(integer=True))  # n and K are integers
    xl = ax.set_xlabel(xlabel)
    yl = ax.set_ylabel(ylabel)
    xl.set_gid("xlabel")
    yl.set_gid("ylabel")


def new_figure(nrows=1, height_ratios=None):
    fig, axes = plt.subplots(nrows, 1, figsize=FIGSIZE, dpi=DPI, sharex=(nrows > 1),
                             gridspec_kw={"height_ratios": height_ratios} if height_ratios else None)
    fig.subplots_adjust(left=0.12, right=0.97, top=0.90, bottom=0.17, hspace=0.08)
    return fig, axes


def save(fig, out):
    ext = os.path.splitext(out)[1].lower()
    if ext not in (".png", ".svg"):
        raise SystemExit("plot.py: error: output must end in .png or .svg, got '%s'" % out)
    d = os.path.dirname(os.path.abspath(out))
    os.makedirs(d, exist_ok=True)
    tmp = os.path.join(d, ".%s.tmp%s" % (os.path.basename(out), ext))
    # No bbox_inches='tight': the pixel size is FIGSIZE × DPI exactly.
    fig.savefig(tmp, dpi=DPI, format=ext[1:], metadata={"Date": None} if ext == ".svg" else None)
    os.replace(tmp, out)
    plt.close(fig)


# ------------------------------------------------------------------ ratio --

def ratio_setup(table, cert=None):
    """Families, progressions and range of a ratio table, from its JSON, its command, or the certificate."""
    meta = table.meta or {}
    pos, opts = command_options(table.provenance.get("command", ""))
    fams = [p for p in pos if family_parts(p)[0]]
    F = meta.get("F") or (fams[0] if fams else None) or (cert or {}).get("F")
    G = meta.get("G") or (fams[1] if len(fams) > 1 else None) or (cert or {}).get("G")
    ap = meta.get("ap") or opts.get("--ap") or (cert or {}).get("ap")
    ap2 = meta.get("ap2") or opts.get("--ap2") or (cert or {}).get("ap2")
    return F or "F", G or "G", _ap(ap), _ap(ap2)


def ratio_points(table):
    """(n, exact ratio) pairs for the rows where G ≠ 0, and (n, main-term ratio mid, rad)."""
    n = [int(float(v)) for v in table.col("n", "k")]
    exact = None
    name = table.find("ratio", "exact_ratio", "count_ratio", "ratio_exact", "R")
    if name:
        exact = floats(table.col(name))
    elif table.has("count_F", "F") and table.has("count_G", "G"):
        f = table.col("count_F", "F")
        g = table.col("count_G", "G")
        exact = [float(Fraction(int(a), int(b))) if int(b) != 0 else None for a, b in zip(f, g)]
    main = None
    mname = table.find("main_term_ratio", "main_ratio", "ratio_main", "main_ratio_ball")
    if mname:
        main = [parse_ball(v) if v not in (None, "", "undefined") else (None, None) for v in table.col(mname)]
    elif table.find("main_ratio_mid"):
        mids = floats(table.col("main_ratio_mid"))
        rads = floats(table.col("main_ratio_rad")) if table.find("main_ratio_rad") else [0.0] * len(mids)
        main = list(zip(mids, rads))
    return n, exact, main


def ratio_from_counts(tf, tg):
    """A ratio table from two `circlet count FAMILY --ap A,B --to K` outputs (F over G), row by row."""
    pf, of = command_options(tf.provenance.get("command", "") or "")
    pg, og = command_options(tg.provenance.get("command", "") or "")
    F = (tf.meta or {}).get("family") or next((p for p in pf if family_parts(p)[0]), "F")
    G = (tg.meta or {}).get("family") or next((p for p in pg if family_parts(p)[0]), "G")
    cf, cg = tf.col("count"), tg.col("count")
    rows = []
    for i, (a, b) in enumerate(zip(cf, cg)):
        a, b = int(a), int(b)
        rows.append([i, a, b, str(Fraction(a, b)) if b else "undefined"])
    prov = dict(tf.provenance)
    prov["command"] = "%s ; %s" % (tf.provenance.get("command", "?"), tg.provenance.get("command", "?"))
    meta = {"F": F, "G": G, "ap": of.get("--ap") or "1,0", "ap2": og.get("--ap") or "1,0"}
    return Table(["n", "count_F", "count_G", "ratio"], rows, prov, meta, tf.path)


def cert_bands(cert):
    """[(label, lo, hi, residue or None, modulus or None)] from a certificate."""
    bands = []
    verdict = cert.get("verdict")
    if verdict == "NON-CONVERGENT":
        M = int(cert["modulus"])
        for cl in cert.get("classes", []):
            mid, rad = parse_ball(cl["limit_interval"])
            r = int(cl["residue"])
            bands.append((r"limit on $n \equiv %d\ (\mathrm{mod}\ %d)$" % (r, M), mid - rad, mid + rad, r, M))
    elif verdict == "CONSTANT":
        mid, rad = parse_ball(cert["constant"]["interval"])
        bands.append(("limit", mid - rad, mid + rad, None, None))
    return bands


def plot_ratio(table, out, cert=None):
    F, G, (A, B), (A2, B2) = ratio_setup(table, cert)
    n, exact, main = ratio_points(table)
    fig, ax = new_figure()
    ftex = family_tex(F, progression_tex(A, B))
    gtex = family_tex(G, progression_tex(A2, B2))
    colors = ["tab:blue", "tab:red", "tab:green", "tab:purple"]
    bands = cert_bands(cert) if cert else []
    split = [b for b in bands if b[3] is not None]
    pts = [(k, v) for k, v in zip(n, exact or []) if v is not None and math.isfinite(v)]
    if split:
        # Colour the points of each certified class; the rest in grey.
        used = set()
        for i, (_, _, _, r, M) in enumerate(split):
            sel = [(k, v) for k, v in pts if k % M == r]
            used.update(k for k, _ in sel)
            if sel:
                ax.plot(*zip(*sel), "o", ms=3.5, color=colors[i], label=r"$R(n)$, $n \equiv %d\ (\mathrm{mod}\ %d)$" % (r, M))
        rest = [(k, v) for k, v in pts if k not in used]
        if rest:
            ax.plot(*zip(*rest), ".", ms=3, color="0.55", label=r"$R(n)$, other $n$")
    elif pts:
        ax.plot(*zip(*pts), "o", ms=3, color="tab:blue", label=r"$R(n)$ exact")
    if main:
        mp = [(k, m) for k, (m, r) in zip(n, main) if m is not None and math.isfinite(m)]
        if split:
            # The main-term ratio along each certified class: it tends to that class's band.
            for i, (_, _, _, r, M) in enumerate(split):
                sel = [(k, m) for k, m in mp if k % M == r]
                if sel:
                    ax.plot(*zip(*sel), "-", lw=1.0, color=colors[i], alpha=0.8,
                            label=r"$M_F/M_G$ on $n \equiv %d\ (\mathrm{mod}\ %d)$" % (r, M))
        elif mp:
            ax.plot(*zip(*mp), "x", ms=3, color="0.2", alpha=0.6, label=r"$M_F/M_G$ (main-term ratio)")
    for i, (label, lo, hi, r, M) in enumerate(bands):
        c = colors[i] if r is not None else "tab:orange"
        ax.axhspan(lo, hi, color=c, alpha=0.25, lw=0)
        ax.axhline((lo + hi) / 2, color=c, lw=1.0, ls="--", label=label + " (certified)")
    nmin, nmax = (min(n), max(n)) if n else (0, 0)
    if bands:
        # Frame the certified bands and the later points (n ≥ nmax/5); a few
        # small-n ratios far away would otherwise flatten the picture.
        late = sorted(v for k, v in pts if k >= nmax / 5)
        lo = min([b[1] for b in bands] + late[:1])
        hi = max([b[2] for b in bands] + late[-1:])
        pad = 0.15 * (hi - lo if hi > lo else abs(hi) + 1.0)
        ax.set_ylim(lo - pad, hi + pad)
    _label(ax, r"$n$", r"$R(n) = %s\,/\,%s$" % (ftex, gtex))
    ax.set_title(r"Ratio $%s\,/\,%s$ along the progressions, $n = %d,\dots,%d$" % (ftex, gtex, nmin, nmax))
    leg = ax.legend(loc="best", fontsize=8, title=("certificate: %s" % cert.get("verdict", "?")) if cert else None)
    if cert:
        leg.get_title().set_fontsize(8)
    caption(fig, table.provenance, (cert or {}).get("provenance"))
    save(fig, out)


# -------------------------------------------------------------- remainder --

def remainder_setup(table):
    meta = table.meta or {}
    pos, opts = command_options(table.provenance.get("command", ""))
    fams = [p for p in pos if family_parts(p)[0]]
    fam = meta.get("family") or (fams[0] if fams else None)
    ap = meta.get("ap") or opts.get("--ap")
    return fam, _ap(ap)


def remainder_series(table, fam, A, B):
    """The progression variable, X, E as doubles, and the normalised values E/X^{(w−1)/2}, E/X^{w/2}.

    With --ap the commands write k (the progression variable) and n = A·k + B;
    the plot's variable is then k, shown as n in the labels F(An+B)."""
    r = family_rank(fam) if fam else None
    if table.find("k") and table.find("n"):
        var = [int(float(v)) for v in table.col("k")]
        args = [int(float(v)) for v in table.col("n")]
    else:
        var = [int(float(v)) for v in table.col("n")]
        args = [A * k + B for k in var]
    n = var
    if table.find("X"):
        X = floats(table.col("X"))
    else:
        delta = family_shift(fam)
        X = [float(a + delta) for a in args]
    ename = table.find("remainder", "E", "E_n", "remainder_mid", "error")
    E = [parse_ball(v)[0] for v in table.col(ename)] if ename else None
    dname = table.find("E_deligne", "normalised_deligne", "deligne", "E_over_deligne", "remainder_deligne",
                       "norm_deligne")
    hname = table.find("E_hecke", "normalised_hecke", "hecke", "E_over_hecke", "remainder_hecke", "norm_hecke")
    if dname:
        dn = [parse_ball(v)[0] for v in table.col(dname)]
    else:
        dn = [e / x ** ((r / 2 - 1) / 2) if e is not None and x > 0 else None for e, x in zip(E, X)]
    if hname:
        hn = [parse_ball(v)[0] for v in table.col(hname)]
    else:
        hn = [e / x ** (r / 4) if e is not None and x > 0 else None for e, x in zip(E, X)]
    return n, X, E, dn, hn, r


def plot_remainder(table, out):
    fam, (A, B) = remainder_setup(table)
    n, X, E, dn, hn, r = remainder_series(table, fam, A, B)
    fig, ax = new_figure()
    pts = [(k, v) for k, v in zip(n, dn) if v is not None and math.isfinite(v)]
    arg = progression_tex(A, B)
    ftex = family_tex(fam, arg) if fam else "F(n)"
    w = weight_tex(r) if r else "w"
    if pts:
        ax.plot(*zip(*pts), ".", ms=2.5, color="tab:blue", zorder=3,
                label=r"$E(n)/X^{(w-1)/2}$, $E = %s - M(%s)$" % (ftex, arg))
    # Reference lines, in units of the Deligne scale X^{(w−1)/2}: the Deligne
    # scale itself is ±1; the Hecke scale X^{w/2} is ±X^{1/2}.
    ax.axhline(1, color="tab:green", lw=1.2, label=r"Deligne scale $\pm X^{(w-1)/2}$")
    ax.axhline(-1, color="tab:green", lw=1.2)
    # A certified bound |E(n)| ≤ B(n), when the command offers one (c7: d(n+2)(n+2)/8).
    if table.find("certified_bound"):
        cb = [(k, to_float(b), x) for k, b, x in zip(n, table.col("certified_bound"), X)]
        cb = [(k, b / x ** ((r / 2 - 1) / 2)) for k, b, x in cb if b is not None and x > 0]
        if cb:
            ax.plot(*zip(*cb), ".", ms=1.2, color="tab:purple", alpha=0.3, zorder=1,
                    label=r"certified bound $\pm B(n)/X^{(w-1)/2}$")
            ax.plot([k for k, _ in cb], [-v for _, v in cb], ".", ms=1.2, color="tab:purple", alpha=0.3, zorder=1)
    xs = sorted(zip(n, X))
    ax.plot([k for k, _ in xs], [math.sqrt(x) for _, x in xs], color="tab:red", lw=1.2,
            label=r"Hecke scale $\pm X^{w/2}$")
    ax.plot([k for k, _ in xs], [-math.sqrt(x) for _, x in xs], color="tab:red", lw=1.2)
    # Symmetric log scale: linear inside the Deligne band |y| ≤ 1, logarithmic
    # outside, so the points and the growing Hecke curve are both visible.
    m = max([abs(v) for _, v in pts] + [1.0] + [math.sqrt(x) for x in X if x > 0])
    ax.set_yscale("symlog", linthresh=1.0)
    ax.set_ylim(-1.5 * m, 1.5 * m)
    nmin, nmax = (min(n), max(n)) if n else (0, 0)
    _label(ax, r"$n$", r"$E(n)\,/\,X^{(w-1)/2}$,  $X = %s + \Delta$" % arg)
    ax.set_title(r"Normalised remainder of $%s$ (weight $w = %s$), $n = %d,\dots,%d$" % (ftex, w, nmin, nmax))
    ax.legend(loc="upper left", fontsize=8)
    caption(fig, table.provenance)
    save(fig, out)


# ------------------------------------------------------------------- arcs --

def _is_int(v):
    try:
        int(str(v))
        return True
    except ValueError:
        return False


def arcs_setup(table, main_json=None):
    meta = table.meta or {}
    main = None
    # `circlet arcs` CSV: after the rows k = 1..K, summary rows "enclosure" and
    # "main_term" (the main-term ball in the partial_sum column).
    if "k" in table.columns:
        i = table.columns.index("k")
        for r in table.rows:
            if str(r[i]) == "main_term" and table.find("partial_sum"):
                main = parse_ball(r[table.columns.index("partial_sum")])
    if main is None and "main_term" in table.columns and table.rows:  # or a main_term column
        v = table.rows[0][table.columns.index("main_term")]
        if v not in (None, ""):
            main = parse_ball(v)
    pos, opts = command_options(table.provenance.get("command", ""))
    fams = [p for p in pos if family_parts(p)[0]]
    fam = meta.get("family") or (fams[0] if fams else None)
    at = meta.get("n", meta.get("at", opts.get("--at")))
    # An explicit `circlet main --json` wins; then the arcs output's own main term.
    sources = [main_json or {}] + ([] if main else [meta])
    for src in sources:
        for key in ("main_term", "main", "M", "main_term_ball"):
            if key in src and src[key] not in (None, ""):
                main = parse_ball(src[key])
                break
        else:
            continue
        break
    return fam, at, main


def arcs_series(table):
    keep = [_is_int(v) for v in table.col("k", "K")]
    table = Table(table.columns, [r for r, ok in zip(table.rows, keep) if ok], table.provenance, table.meta,
                  table.path)
    k = [int(v) for v in table.col("k", "K")]
    pname = table.find("partial_sum", "partial", "sum", "S_K", "partial_sum_ball")
    partial = [parse_ball(v) for v in table.col(pname)] if pname else None
    if partial is None and table.find("partial_mid"):
        partial = list(zip(floats(table.col("partial_mid")), floats(table.col("partial_rad"))))
    tname = table.find("tail_bound", "tail", "tail_bound_ball")
    tail = [parse_ball(v) for v in table.col(tname)] if tname else None
    # A tail bound is an upper bound: display its upper end.
    tail = [(m + rad) if m is not None else None for m, rad in tail] if tail else None
    return k, partial, tail


def plot_arcs(table, out, main_json=None):
    fam, at, main = arcs_setup(table, main_json)
    k, partial, tail = arcs_series(table)
    fig, (ax, ax2) = new_figure(2, height_ratios=[3, 2])
    fig.subplots_adjust(top=0.88)
    ftex = family_tex(fam, str(at)) if fam else "F(n)"
    pk = [(kk, m, r) for kk, (m, r) in zip(k, partial) if m is not None]
    ax.errorbar([a for a, _, _ in pk], [m for _, m, _ in pk], yerr=[r for _, _, r in pk], fmt="o-", ms=3, lw=0.8,
                color="tab:blue", label=r"partial sum $S_K = \sigma_\infty(X)\sum_{k \leq K} A_k(n)/k^{w}$")
    tail_at = {kk: t for kk, t in zip(k, tail or []) if t is not None and math.isfinite(t)}
    band = [(a, m - r - tail_at[a], m + r + tail_at[a]) for a, m, r in pk if a in tail_at]
    if band:
        ax.fill_between([a for a, _, _ in band], [lo for _, lo, _ in band], [hi for _, _, hi in band],
                        color="tab:blue", alpha=0.12, lw=0, label=r"$S_K \pm T_K$ (tail bound)")
    if main:
        mm, mr = main
        ax.axhspan(mm - mr, mm + mr, color="tab:orange", alpha=0.35, lw=0)
        ax.axhline(mm, color="tab:orange", lw=1.2, label=r"main term $M(n)$ (ball)")
        # Zoom onto the main term: the first few partial sums may be far away.
        spread = max([abs(m - mm) for _, m, _ in pk[len(pk) // 4:]] + [mr, abs(mm) * 1e-12])
        ax.set_ylim(mm - 6 * spread, mm + 6 * spread)
    _label(ax, "", r"$S_K$")
    ax.legend(loc="upper right", fontsize=8)
    # Lower panel: distance to the main term against the certified tail bound.
    if main:
        d = [(a, abs(m - main[0])) for a, m, _ in pk if abs(m - main[0]) > 0]
        if d:
            ax2.semilogy(*zip(*d), "o", ms=3, color="tab:blue", label=r"$|S_K - M(n)|$ (midpoints)")
    tk = sorted((a, t) for a, t in tail_at.items() if t > 0)
    if tk:
        ax2.semilogy(*zip(*tk), "-", color="tab:red", lw=1.2, label=r"tail bound $T_K \geq |\sum_{k>K}|$")
    else:
        ax2.text(0.5, 0.5, "no finite tail bound (the series does not converge absolutely at this weight)",
                 transform=ax2.transAxes, ha="center", va="center", fontsize=9, color="tab:red")
    ax2.set_yscale("log")
    ax2.legend(loc="upper right", fontsize=8)
    xl = ax2.set_xlabel(r"$K$ (largest denominator $k$ of the major arcs)")
    xl.set_gid("xlabel")
    yl = ax2.set_ylabel(r"$|S_K - M(n)|$, $T_K$")
    yl.set_gid("ylabel2")
    ax.set_title(r"Major arcs of $%s$: partial sums, $K = %d,\dots,%d$" % (ftex, min(k), max(k)) if k else "arcs")
    caption(fig, table.provenance, (main_json or {}).get("provenance"))
    save(fig, out)


# -------------------------------------------------------------------- cli --

def main(argv=None):
    p = argparse.ArgumentParser(
        prog="plot.py", description="Standard plots of circlet output (PNG %dx%d pixels, or SVG)." % PIXELS)
    p.add_argument("kind", choices=["ratio", "remainder", "arcs"])
    p.add_argument("input", help="CSV (with its '# circlet ...' line) or JSON written by circlet")
    p.add_argument("-o", "--output", required=True, action="append",
                   help="FILE.png or FILE.svg (repeat to write both from one run)")
    p.add_argument("--cert", help="ratio: certificate JSON from 'circlet certify' (bands)")
    p.add_argument("--over", metavar="G_COUNTS",
                   help="ratio: INPUT is 'circlet count F --ap A,B --to K' output and G_COUNTS the same for G; "
                        "the exact ratios are formed here")
    p.add_argument("--main", help="arcs: JSON from 'circlet main --json' with the main-term ball")
    a = p.parse_args(argv)
    try:
        table = load_table(a.input)
    except (OSError, ValueError) as e:
        print("plot.py: error: cannot read %s: %s" % (a.input, e), file=sys.stderr)
        return 2
    if a.over:
        if a.kind != "ratio":
            print("plot.py: error: --over is for the ratio plot", file=sys.stderr)
            return 2
        try:
            table = ratio_from_counts(table, load_table(a.over))
        except (OSError, ValueError, KeyError) as e:
            print("plot.py: error: cannot form the ratio with %s: %s" % (a.over, e), file=sys.stderr)
            return 2
    if len(table) == 0:
        print("plot.py: error: %s has no rows to plot" % a.input, file=sys.stderr)
        return 2
    for out in a.output:
        if os.path.splitext(out)[1].lower() not in (".png", ".svg"):
            print("plot.py: error: output must end in .png or .svg, got '%s'" % out, file=sys.stderr)
            return 2
    try:
        cert = load_json(a.cert) if a.cert else None
        main_json = load_json(a.main) if a.main else None
    except (OSError, ValueError) as e:
        print("plot.py: error: cannot read %s: %s" % (a.cert or a.main, e), file=sys.stderr)
        return 2
    for out in a.output:
        try:
            if a.kind == "ratio":
                plot_ratio(table, out, cert)
            elif a.kind == "remainder":
                plot_remainder(table, out)
            else:
                plot_arcs(table, out, main_json)
        except KeyError as e:
            print("plot.py: error: %s" % e.args[0], file=sys.stderr)
            return 2
        print(out)
    return 0


if __name__ == "__main__":
    sys.exit(main())
