#!/usr/bin/python3
"""Standard pictures of circlet output (matplotlib, Agg backend).

    scripts/plot.py ratio     RATIO.csv|RATIO.json [--cert CERT.json]  -o FILE
    scripts/plot.py ratio     F_COUNTS.csv --over G_COUNTS.csv [--cert CERT.json] -o FILE
    scripts/plot.py remainder REMAINDER.csv|.json (or `circlet main --to` output) -o FILE
    scripts/plot.py relerr    REMAINDER.csv|.json (or `circlet main --to` output) -o FILE
    scripts/plot.py arcs      ARCS.csv|ARCS.json [--main MAIN.json]    -o FILE
    scripts/plot.py scan      DIR/scan.csv                              -o FILE

FILE ends in .png, .svg or .pdf; repeat -o to write several from one run.
--size W,H (inches, default 8,6) and --dpi D (default 100) set the figure: a
PNG is W·D × H·D pixels. SVG and PDF keep text as text (the SVG names each
text in an XML comment, so a test can find it).

The input is what the circlet commands write: a CSV file that starts with the
`# circlet VERSION | COMMAND | DATE | ...` provenance line (`-o FILE`, or
standard output redirected to a file), or their `--json` output. Each plot
kind checks that its input is the output of a command it can draw and stops
with exit status 2 and a one-line message otherwise.

What is labelled "certified" is exactly what a certificate (`circlet certify
-o CERT.json`) certifies: the limit intervals of its classes, drawn as shaded
bands. Their midpoints are drawn dashed and labelled as midpoints. Reference
curves (Deligne and Hecke scales, reference slopes) are labelled as scales,
not bounds; the only bound drawn as a bound is one the command itself proves
(`certified_bound` of `circlet remainder c7`). Numbers are converted to double
precision for display only.

This file is also a small library for the notebooks (plot_ratio,
plot_remainder, plot_relerr, plot_arcs, plot_scan, and the readers of
scripts/circlet_data.py re-exported: load_table, parse_ball, to_float).
"""
import argparse
import math
import os
import re
import shlex
import sys
import textwrap
from fractions import Fraction

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import circlet_data  # noqa: E402
from circlet_data import Table, load_table, to_float  # noqa: E402,F401

import matplotlib  # noqa: E402

if "ipykernel" not in sys.modules:  # notebooks keep their inline backend; files are the same
    matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
from matplotlib.colors import BoundaryNorm, ListedColormap  # noqa: E402
from matplotlib.lines import Line2D  # noqa: E402
from matplotlib.patches import Patch  # noqa: E402
from matplotlib.ticker import FuncFormatter, MaxNLocator  # noqa: E402

FIGSIZE = (8.0, 6.0)  # inches (default; --size)
DPI = 100  # (default; --dpi)
PIXELS = (int(FIGSIZE[0] * DPI), int(FIGSIZE[1] * DPI))
FORMATS = (".png", ".svg", ".pdf")

# The project's own look: warm paper background, ink-coloured axes on two
# sides only, ticks inside, dotted grid, a serif face, and a palette of muted
# colours chosen so that the two classes of a certificate stay apart in grey print.
INK = "#26323d"
PAPER = "#fbf9f4"
PALETTE = ["#1f6f8b", "#c8553d", "#6a994e", "#8e6bb0", "#d4a017", "#3a3a3a"]
GREY = "#9a9590"
STYLE = {
    "font.family": "serif",
    "font.serif": ["DejaVu Serif"],
    "mathtext.fontset": "dejavuserif",
    "font.size": 10,
    "axes.facecolor": PAPER,
    "axes.edgecolor": INK,
    "axes.labelcolor": INK,
    "axes.titlesize": 11,
    "axes.titlelocation": "left",
    "axes.titlecolor": INK,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.grid": True,
    "axes.axisbelow": True,
    "axes.prop_cycle": matplotlib.cycler(color=PALETTE),
    "axes.formatter.useoffset": False,  # no "1e7" / "+4.9e6" offsets: tick labels are the values
    "grid.color": "#d9d3c7",
    "grid.linestyle": ":",
    "grid.linewidth": 0.8,
    "xtick.direction": "in",
    "ytick.direction": "in",
    "xtick.color": INK,
    "ytick.color": INK,
    "legend.frameon": False,
    "legend.fontsize": 8,
    "lines.linewidth": 1.3,
    "svg.fonttype": "none",  # text stays text in the SVG
    "svg.hashsalt": "circlet",  # stable ids, so re-running gives the same SVG
    "pdf.fonttype": 42,
}
plt.rcParams.update(STYLE)


class PlotError(Exception):
    """Bad input for a plot: reported as 'plot.py: error: ...', exit status 2."""


# ---------------------------------------------------------------- numbers --

def parse_ball(x):
    """(mid, rad) as doubles (scripts/circlet_data.py: ball)."""
    b = circlet_data.ball(x)
    return b.mid, b.rad


def floats(values):
    return [to_float(v) for v in values]


def _plain(v, _pos=None):
    """Tick labels without offset or exponent: 14,181,871, 14,181,871.41, 0.25, -10."""
    if v == 0:
        return "0"
    if abs(v) >= 1e4:
        return "{:,.0f}".format(v) if float(v).is_integer() else "{:,.2f}".format(v)
    return "{:.6g}".format(v).replace("-", "\u2212")



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



# ------------------------------------------------------------ figure frame --

class Frame:
    """Figure size and resolution of one run (--size, --dpi)."""
    size = FIGSIZE
    dpi = DPI


def caption(fig, *provs):
    """Provenance at the bottom of the figure: one line per input (version, git commit, command,
    date), then the library versions once."""
    lines, libs = [], None
    width = max(60, int(Frame.size[0] * 72 / (6.5 * 0.6)) - 6)  # monospace 6.5 pt: about 0.6 em per character
    for p in provs:
        if not p:
            continue
        head = "%s %s" % (p.get("program", "circlet"), p.get("version", "?"))
        git = p.get("git") or p.get("git_commit")
        if git:
            head += " (git %s)" % git
        line = "%s | %s | %s" % (head, p.get("command", "?"), p.get("date", ""))
        lines.extend(textwrap.wrap(line, width=width, subsequent_indent="    ", break_on_hyphens=False))
        found = dict(p.get("libraries") or {})
        for key in ("flint", "arb", "ntl"):
            if p.get(key):
                found[key] = p[key]
        if found and libs is None:
            libs = ", ".join("%s %s" % (k, found[k]) for k in ("flint", "arb", "ntl") if found.get(k))
    if libs:
        lines.append("built with " + libs)
    text = "\n".join(lines)
    fig.text(0.01, 0.005, text, fontsize=6.5, family="monospace", ha="left", va="bottom", color="#6b665f",
             gid="caption")
    # Keep the axes (tick labels and x label) above a long caption.
    line_height = 6.5 * 1.25 / (Frame.size[1] * 72)
    needed = 0.012 + len(lines) * line_height + 0.085 * 6.0 / Frame.size[1]
    if needed > fig.subplotpars.bottom:
        top = fig.subplotpars.top
        fig.subplots_adjust(bottom=min(needed, top - 0.2))
    return text


def _label(ax, xlabel, ylabel, integer_x=True):
    """Axis labels in mathtext; the SVG gets them as XML comments (backend_svg) and as gids."""
    if integer_x:
        ax.xaxis.set_major_locator(MaxNLocator(integer=True))  # n and K are integers
    xl = ax.set_xlabel(xlabel)
    yl = ax.set_ylabel(ylabel)
    xl.set_gid("xlabel")
    yl.set_gid("ylabel")


def new_figure(nrows=1, height_ratios=None, legend_right=True):
    """A figure of Frame.size; with legend_right the axes leave the right third for the legend."""
    fig, axes = plt.subplots(nrows, 1, figsize=Frame.size, dpi=Frame.dpi, sharex=(nrows > 1),
                             gridspec_kw={"height_ratios": height_ratios} if height_ratios else None)
    fig.subplots_adjust(left=0.11, right=0.66 if legend_right else 0.97, top=0.90, bottom=0.15, hspace=0.10)
    return fig, axes


def outside_legend(ax, title=None, **kw):
    """The legend to the right of the axes, so that it never covers data."""
    leg = ax.legend(loc="upper left", bbox_to_anchor=(1.02, 1.0), borderaxespad=0.0, title=title, **kw)
    if title:
        leg.get_title().set_fontsize(8)
        leg.get_title().set_color(INK)
    return leg


def note(ax, text, slot=0):
    """A remark in the right margin under the legend (e.g. 'no plotted n lies in this class'),
    outside the axes so that it never covers data; slot 0 is the lowest line."""
    fig = ax.figure
    x0 = ax.get_position().x1 + 0.02
    width = max(20, int((0.99 - x0) * Frame.size[0] * 13))
    wrapped = "\n".join(textwrap.wrap(text, width=width)) if "$" not in text else text
    fig.text(x0, ax.get_position().y0 + 0.075 * slot, wrapped, ha="left", va="bottom", fontsize=7.5,
             color="#8a3b2b", gid="note")


def check_output_name(out):
    ext = os.path.splitext(out)[1].lower()
    if ext not in FORMATS:
        raise PlotError("output must end in .png, .svg or .pdf, got '%s'" % out)
    return ext


def save(fig, out):
    ext = check_output_name(out)
    d = os.path.dirname(os.path.abspath(out))
    os.makedirs(d, exist_ok=True)
    tmp = os.path.join(d, ".%s.tmp%s" % (os.path.basename(out), ext))
    meta = {".svg": {"Date": None}, ".pdf": {"CreationDate": None, "ModDate": None}}.get(ext)
    # No bbox_inches='tight': the pixel size is size × dpi exactly.
    fig.savefig(tmp, dpi=Frame.dpi, format=ext[1:], metadata=meta)
    os.replace(tmp, out)
    plt.close(fig)


# ------------------------------------------------------------ input kinds --

# Which circlet commands each plot kind can draw, and the columns that tell
# them apart when a file carries no provenance.
ACCEPTS = {
    "ratio": ("ratio",),
    "remainder": ("remainder", "main"),
    "relerr": ("remainder", "main"),
    "arcs": ("arcs",),
    "scan": ("scan", "scan-merge"),
}
WHAT = {
    "ratio": "`circlet ratio` output (or `circlet count` output with --over)",
    "remainder": "`circlet remainder` or `circlet main --to` output",
    "relerr": "`circlet remainder` or `circlet main --to` output",
    "arcs": "`circlet arcs` output",
    "scan": "a scan table (DIR/scan.csv of `circlet scan`)",
}


def input_kind(table):
    """The circlet command that wrote `table`: from its provenance, else from its columns."""
    cmd = table.command()
    if cmd:
        return cmd
    cols = set(table.columns)
    if "verdict" in cols and "A2" in cols:
        return "scan"
    if "partial_sum" in cols or "coefficient" in cols:
        return "arcs"
    if "F_count" in cols or "main_term_ratio" in cols:
        return "ratio"
    if "E_deligne" in cols or "remainder_exact" in cols:
        return "remainder"
    if {"count", "main"} <= cols:
        return "main"
    if "count" in cols:
        return "count"
    return None


def check_input_kind(kind, table, over=False):
    got = input_kind(table)
    ok = ACCEPTS[kind] + (("count",) if kind == "ratio" and over else ())
    if got in ok:
        return
    if got is None:
        raise PlotError("%s: cannot tell which circlet command wrote it; the %s plot reads %s"
                        % (table.path, kind, WHAT[kind]))
    raise PlotError("%s is `circlet %s` output; the %s plot reads %s" % (table.path, got, kind, WHAT[kind]))


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
    elif table.has("count_F", "F_count") and table.has("count_G", "G_count"):
        f = table.col("count_F", "F_count")
        g = table.col("count_G", "G_count")
        exact = [float(Fraction(int(a), int(b))) if int(b) != 0 else None for a, b in zip(f, g)]
    main = None
    mname = table.find("main_term_ratio", "main_ratio", "ratio_main", "main_ratio_ball")
    if mname:
        main = [parse_ball(v) if v not in (None, "", "undefined") else (None, None) for v in table.col(mname)]
    return n, exact, main


def ratio_from_counts(tf, tg):
    """A ratio table from two `circlet count FAMILY --ap A,B --to K` outputs (F over G), row by row."""
    for t in (tf, tg):
        if input_kind(t) != "count":
            raise PlotError("%s is `circlet %s` output; --over needs two `circlet count` outputs"
                            % (t.path, input_kind(t)))
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
    """[(label, lo, hi, residue or None, modulus or None)]: the certified limit intervals of a certificate."""
    bands = []
    verdict = cert.get("verdict")
    if verdict == "NON-CONVERGENT":
        M = int(cert["modulus"])
        for cl in cert.get("classes", []):
            mid, rad = parse_ball(cl["limit_interval"])
            r = int(cl["residue"])
            bands.append((r"certified limit interval, $n \equiv %d\ (\mathrm{mod}\ %d)$" % (r, M),
                          mid - rad, mid + rad, r, M))
    elif verdict == "CONSTANT":
        mid, rad = parse_ball(cert["constant"]["interval"])
        bands.append(("certified constant (interval)", mid - rad, mid + rad, None, None))
    return bands


def _first_in_class(r, M, after):
    """The least n ≥ after with n ≡ r (mod M)."""
    return after + ((r - after) % M)


def plot_ratio(table, out, cert=None):
    F, G, (A, B), (A2, B2) = ratio_setup(table, cert)
    n, exact, main = ratio_points(table)
    if exact is None:
        raise PlotError("%s: no exact ratio column (ratio, or count_F and count_G)" % table.path)
    fig, ax = new_figure()
    ftex = family_tex(F, progression_tex(A, B))
    gtex = family_tex(G, progression_tex(A2, B2))
    bands = cert_bands(cert) if cert else []
    split = [b for b in bands if b[3] is not None]
    pts = [(k, v) for k, v in zip(n, exact) if v is not None and math.isfinite(v)]
    undefined = sum(1 for v in exact if v is None)
    nmin, nmax = (min(n), max(n)) if n else (0, 0)
    empty, remarks = [], []
    if split:
        # Colour the points of each certified class; the rest in grey.
        used = set()
        for i, (_, _, _, r, M) in enumerate(split):
            sel = [(k, v) for k, v in pts if k % M == r]
            used.update(k for k, _ in sel)
            if sel:
                ax.plot(*zip(*sel), "o", ms=4, color=PALETTE[i], mec="white", mew=0.5, zorder=4,
                        label=r"$R(n)$, $n \equiv %d\ (\mathrm{mod}\ %d)$" % (r, M))
            else:
                empty.append((r, M))
        rest = [(k, v) for k, v in pts if k not in used]
        if rest:
            ax.plot(*zip(*rest), ".", ms=3, color=GREY, zorder=3, label=r"$R(n)$, other $n$")
    elif pts:
        ax.plot(*zip(*pts), "o", ms=3.2, color=PALETTE[0], mec="white", mew=0.4, zorder=4, label=r"$R(n)$ exact")
    if main:
        mp = [(k, m) for k, (m, r) in zip(n, main) if m is not None and math.isfinite(m)]
        if split:
            # The main-term ratio along each certified class: it tends to that class's interval.
            for i, (_, _, _, r, M) in enumerate(split):
                sel = [(k, m) for k, m in mp if k % M == r]
                if sel:
                    ax.plot(*zip(*sel), "-", lw=1.0, color=PALETTE[i], alpha=0.8, zorder=3,
                            label=r"$M_F/M_G$ on $n \equiv %d\ (\mathrm{mod}\ %d)$" % (r, M))
        elif mp:
            ax.plot(*zip(*mp), "x", ms=3, color=INK, alpha=0.6, label=r"$M_F/M_G$ (main-term ratio)")
    for i, (label, lo, hi, r, M) in enumerate(bands):
        c = PALETTE[i] if r is not None else PALETTE[4]
        ax.axhspan(lo, hi, color=c, alpha=0.22, lw=0, zorder=1, label=label)
        ax.axhline((lo + hi) / 2, color=c, lw=0.9, ls=(0, (4, 3)), zorder=2)
    if bands:
        ax.plot([], [], color=INK, lw=0.9, ls=(0, (4, 3)), label="midpoint of a certified interval\n(the midpoint itself is not certified)")
        # Frame the certified intervals and the later points (n ≥ nmax/5); a few
        # small-n ratios far away would otherwise flatten the picture.
        late = sorted(v for k, v in pts if k >= nmax / 5)
        lo = min([b[1] for b in bands] + late[:1])
        hi = max([b[2] for b in bands] + late[-1:])
        pad = 0.15 * (hi - lo if hi > lo else abs(hi) + 1.0)
        ax.set_ylim(lo - pad, hi + pad)
        hidden = sum(1 for k, v in pts if not (lo - pad <= v <= hi + pad))
        if hidden:
            remarks.append("%d point%s with small $n$ outside the frame" % (hidden, "s" if hidden > 1 else ""))
    for r, M in empty:
        remarks.append("no plotted $n$ lies in the class\n"
                       r"$n \equiv %d\ (\mathrm{mod}\ %d)$: its first $n$ is %d" % (r, M, _first_in_class(r, M, nmin)))
    if undefined:
        remarks.append("%d row%s with $%s = 0$\n(ratio undefined) not drawn" % (undefined, "s" if undefined > 1 else "", gtex))
    for i, text in enumerate(remarks):
        note(ax, text, slot=i)
    _label(ax, r"$n$", r"$R(n) = %s\,/\,%s$" % (ftex, gtex))
    ax.set_title(r"Ratio $%s\,/\,%s$, $n = %d,\dots,%d$" % (ftex, gtex, nmin, nmax))
    outside_legend(ax, title=("certificate: %s" % cert.get("verdict", "?")) if cert else None)
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
    if not fam:
        raise PlotError("%s: the family is not recorded (no provenance line, no \"family\")" % table.path)
    r = family_rank(fam)
    if table.find("k") and table.find("n"):
        var = [int(float(v)) for v in table.col("k")]
        args = [int(float(v)) for v in table.col("n")]
    else:
        var = [int(float(v)) for v in table.col("n")]
        args = [A * k + B for k in var]
    if table.find("X"):
        X = floats(table.col("X"))
    else:
        delta = family_shift(fam)
        X = [float(a + delta) for a in args]
    ename = table.find("remainder_exact", "remainder", "E")
    if not ename:
        raise PlotError("%s: no remainder column (remainder, remainder_exact)" % table.path)
    E = [to_float(v) for v in table.col(ename)]
    dname, hname = table.find("E_deligne"), table.find("E_hecke")
    if dname:
        dn = [to_float(v) for v in table.col(dname)]
    else:
        dn = [e / x ** ((r / 2 - 1) / 2) if e is not None and x > 0 else None for e, x in zip(E, X)]
    if hname:
        hn = [to_float(v) for v in table.col(hname)]
    else:
        hn = [e / x ** (r / 4) if e is not None and x > 0 else None for e, x in zip(E, X)]
    return var, X, E, dn, hn, r


def plot_remainder(table, out):
    fam, (A, B) = remainder_setup(table)
    n, X, E, dn, hn, r = remainder_series(table, fam, A, B)
    fig, ax = new_figure()
    pts = [(k, v) for k, v in zip(n, dn) if v is not None and math.isfinite(v)]
    arg = progression_tex(A, B)
    ftex = family_tex(fam, arg)
    w = weight_tex(r)
    if pts:
        ax.plot(*zip(*pts), ".", ms=2.6, color=PALETTE[0], zorder=3,
                label=r"$E(n)/X^{(w-1)/2}$," "\n" r"$E = %s - M(%s)$" % (ftex, arg))
    # Reference curves on this normalised axis: |E| = X^{(w−1)/2} (Deligne's
    # scale) is the pair of lines ±1; |E| = X^{w/2} (Hecke's scale) is ±X^{1/2}.
    ax.axhline(1, color=PALETTE[2], lw=1.3, label="Deligne scale $|E| = X^{(w-1)/2}$:\n" r"the lines $\pm 1$ here")
    ax.axhline(-1, color=PALETTE[2], lw=1.3)
    xs = sorted(zip(n, X))
    ax.plot([k for k, _ in xs], [math.sqrt(x) for _, x in xs], color=PALETTE[1], lw=1.3,
            label="Hecke scale $|E| = X^{w/2}$:\n" r"the curves $\pm X^{1/2}$ here")
    ax.plot([k for k, _ in xs], [-math.sqrt(x) for _, x in xs], color=PALETTE[1], lw=1.3)
    # A certified bound |E(n)| ≤ B(n), when the command proves one (c7: d(n+2)(n+2)/8).
    if table.find("certified_bound"):
        cb = [(k, to_float(b), x) for k, b, x in zip(n, table.col("certified_bound"), X)]
        cb = [(k, b / x ** ((r / 2 - 1) / 2)) for k, b, x in cb if b is not None and x > 0]
        if cb:
            ax.plot(*zip(*cb), ".", ms=1.2, color=PALETTE[3], alpha=0.35, zorder=1,
                    label="proved bound $\\pm B(n)/X^{(w-1)/2}$\n(%s)" % "`certified_bound` column")
            ax.plot([k for k, _ in cb], [-v for _, v in cb], ".", ms=1.2, color=PALETTE[3], alpha=0.35, zorder=1)
    # Symmetric log scale: linear inside the Deligne band |y| ≤ 1, logarithmic
    # outside, so the points and the growing Hecke curve are both visible.
    m = max([abs(v) for _, v in pts] + [1.0] + [math.sqrt(x) for x in X if x > 0])
    ax.set_yscale("symlog", linthresh=1.0)
    ax.set_ylim(-1.5 * m, 1.5 * m)
    ax.yaxis.set_major_formatter(FuncFormatter(_plain))
    nmin, nmax = (min(n), max(n)) if n else (0, 0)
    zero = sum(1 for e in E if e == 0)
    if zero == len(E):
        note(ax, "the remainder is 0 on every row (no cusp part)")
    _label(ax, r"$n$", r"$E(n)\,/\,X^{(w-1)/2}$,  $X = %s + \Delta$" % arg)
    ax.set_title(r"Normalised remainder of $%s$ (weight $w = %s$), $n = %d,\dots,%d$" % (ftex, w, nmin, nmax))
    outside_legend(ax)
    caption(fig, table.provenance)
    save(fig, out)


# ----------------------------------------------------------------- relerr --

def relerr_series(table, fam, A, B):
    """(X, count/M − 1) for the rows with M ≠ 0, exact where count and M are exact."""
    r = family_rank(fam)
    if table.find("k") and table.find("n"):
        args = [int(float(v)) for v in table.col("n")]
    else:
        args = [A * int(float(k)) + B for k in table.col("n")]
    delta = family_shift(fam)
    X = floats(table.col("X")) if table.find("X") else [float(a + delta) for a in args]
    counts = table.col("count")
    mname = table.find("main_term_exact", "main_term", "main")
    if not mname:
        raise PlotError("%s: no main-term column (main_term, main_term_exact, main)" % table.path)
    rel, zero_main, equal = [], 0, 0
    for x, c, m in zip(X, counts, table.col(mname)):
        try:
            q = circlet_data.exact(m)
        except ValueError:
            q = None
        c = int(c)
        if q is not None:
            if q == 0:
                zero_main += 1
                continue
            e = Fraction(c) / Fraction(q) - 1
            if e == 0:
                equal += 1
                continue
            rel.append((x, float(e)))
        else:
            mid = to_float(m)
            if mid is None or mid == 0:
                zero_main += 1
                continue
            rel.append((x, c / mid - 1))
    return rel, zero_main, equal, r


def plot_relerr(table, out):
    fam, (A, B) = remainder_setup(table)
    if not fam:
        raise PlotError("%s: the family is not recorded (no provenance line, no \"family\")" % table.path)
    rel, zero_main, equal, r = relerr_series(table, fam, A, B)
    fig, ax = new_figure()
    arg = progression_tex(A, B)
    ftex = family_tex(fam, arg)
    pos = [(x, e) for x, e in rel if e > 0 and x > 0]
    neg = [(x, -e) for x, e in rel if e < 0 and x > 0]
    if pos:
        ax.loglog(*zip(*pos), ".", ms=3, color=PALETTE[0], label=r"$%s/M - 1 > 0$" % ftex)
    if neg:
        ax.loglog(*zip(*neg), ".", ms=3, color=PALETTE[3], label=r"$%s/M - 1 < 0$ (absolute value)" % ftex)
    w = r / 2
    pts = pos + neg
    if pts:
        # Reference slopes through the largest |count/M − 1| among the upper half of X:
        # Hecke's scale X^{w/2} over M ≍ X^{w−1} gives slope 1 − w/2, Deligne's gives −(w−1)/2.
        xs = sorted(x for x, _ in pts)
        x_lo, x_hi = xs[0], xs[-1]
        upper = [(x, e) for x, e in pts if x >= math.sqrt(x_lo * x_hi)] or pts
        x0, e0 = max(upper, key=lambda p: p[1])
        for slope, color, name in ((1 - w / 2, PALETTE[1], "Hecke"), (-(w - 1) / 2, PALETTE[2], "Deligne")):
            ax.loglog([x_lo, x_hi], [e0 * (x_lo / x0) ** slope, e0 * (x_hi / x0) ** slope], "-", lw=1.1,
                      color=color, alpha=0.9,
                      label=r"slope $%s$: %s scale $X^{%s}/M$" % (_slope_text(slope), name,
                                                                      "w/2" if name == "Hecke" else "(w-1)/2")
                      + "\n(a reference slope, not a bound)")
    remarks = []
    if equal:
        remarks.append("%d row%s with count = M exactly (not on a log scale)" % (equal, "s" if equal > 1 else ""))
    if zero_main:
        remarks.append("%d row%s with M = 0 left out" % (zero_main, "s" if zero_main > 1 else ""))
    if not pts:
        remarks.append("no row with count different from M: nothing to draw on a log scale")
    for i, text in enumerate(remarks):
        note(ax, text, slot=i)
    _label(ax, r"$X = %s + \Delta$" % arg, r"$|%s\,/\,M(%s) - 1|$" % (ftex, arg), integer_x=False)
    ax.set_title(r"Relative error of the main term for $%s$ (weight $w = %s$)" % (ftex, weight_tex(r)))
    outside_legend(ax)
    caption(fig, table.provenance)
    save(fig, out)


def _slope_text(s):
    q = Fraction(s).limit_denominator(8)
    return ("%d" % q.numerator) if q.denominator == 1 else ("%d/%d" % (q.numerator, q.denominator))


# ------------------------------------------------------------------- arcs --

def _is_int(v):
    try:
        int(str(v))
        return True
    except ValueError:
        return False


def arcs_setup(table, main_json=None):
    """Family, n, the main-term ball (mid, rad) and the exact count when known."""
    meta = table.meta or {}
    main = None
    if "k" in table.columns:  # summary rows "main_term" of older arcs CSVs
        i = table.columns.index("k")
        for r in table.rows:
            if str(r[i]) == "main_term" and table.find("partial_sum"):
                main = parse_ball(r[table.columns.index("partial_sum")])
    if main is None and "main_term" in table.columns and table.rows:
        v = table.rows[0][table.columns.index("main_term")]
        if v not in (None, ""):
            main = parse_ball(v)
    pos, opts = command_options(table.provenance.get("command", ""))
    fams = [p for p in pos if family_parts(p)[0]]
    fam = meta.get("family") or (fams[0] if fams else None)
    at = meta.get("n", meta.get("at", opts.get("--at")))
    # An explicit `circlet main --json` wins; then the arcs output's own main term.
    for src in [main_json or {}] + ([] if main else [meta]):
        for key in ("main", "main_term", "M"):
            if key in src and src[key] not in (None, ""):
                main = parse_ball(src[key])
                break
        else:
            continue
        break
    count = None
    for src in (main_json or {}, meta):
        if src.get("count") not in (None, ""):
            try:
                count = int(src["count"])
            except (TypeError, ValueError):
                pass
            break
    return fam, at, main, count


def arcs_series(table):
    keep = [_is_int(v) for v in table.col("k", "K")]
    table = Table(table.columns, [r for r, ok in zip(table.rows, keep) if ok], table.provenance, table.meta,
                  table.path)
    k = [int(v) for v in table.col("k", "K")]
    pname = table.find("partial_sum", "partial", "sum")
    partial = [parse_ball(v) for v in table.col(pname)] if pname else None
    if partial is None:
        raise PlotError("%s: no partial_sum column" % table.path)
    tname = table.find("tail_bound", "tail")
    tail = [parse_ball(v) for v in table.col(tname)] if tname else None
    # A tail bound is an upper bound: display its upper end.
    tail = [(m + rad) if m is not None else None for m, rad in tail] if tail else None
    return k, partial, tail


def plot_arcs(table, out, main_json=None):
    fam, at, main, count = arcs_setup(table, main_json)
    k, partial, tail = arcs_series(table)
    fig, (ax, ax2) = new_figure(2, height_ratios=[3, 2])
    fig.subplots_adjust(top=0.88)
    ftex = family_tex(fam, str(at)) if fam else "F(n)"
    pk = [(kk, m, r) for kk, (m, r) in zip(k, partial) if m is not None]
    ax.errorbar([a for a, _, _ in pk], [m for _, m, _ in pk], yerr=[r for _, _, r in pk], fmt="o-", ms=3.2, lw=0.9,
                color=PALETTE[0], zorder=4,
                label=r"partial sum $S_K = \sigma_\infty(X)\sum_{k \leq K} A_k(n)/k^{w}$")
    tail_at = {kk: t for kk, t in zip(k, tail or []) if t is not None and math.isfinite(t)}
    band = [(a, m - r - tail_at[a], m + r + tail_at[a]) for a, m, r in pk if a in tail_at]
    if band:
        ax.fill_between([a for a, _, _ in band], [lo for _, lo, _ in band], [hi for _, _, hi in band],
                        color=PALETTE[0], alpha=0.13, lw=0, zorder=1,
                        label="$S_K \\pm T_K$: rigorous enclosure\nof the whole arc sum $M(n)$")
    if main:
        mm, mr = main
        ax.axhspan(mm - mr, mm + mr, color=PALETTE[4], alpha=0.35, lw=0)
        exact_main = (main_json or {}).get("main") or (table.meta or {}).get("main_term_exact")
        shown = _plain(mm)
        if exact_main and "/" in str(exact_main):
            shown = "%s\n" % exact_main + r"$\approx$ " + shown
        elif exact_main:
            shown = str(exact_main)
        ax.axhline(mm, color=PALETTE[4], lw=1.4, zorder=3, label="main term $M(n)$ = %s" % shown)
    if count is not None:
        ax.axhline(count, color=PALETTE[1], lw=1.2, ls=(0, (1, 1.5)), zorder=3,
                   label=r"exact count $%s$ = %s" % (ftex, "{:,}".format(count)))
    # Every partial sum in the frame (no clipping of small K), tick labels without offset.
    ys = [m for _, m, _ in pk] + ([main[0]] if main else []) + ([count] if count is not None else [])
    lo, hi = min(ys), max(ys)
    pad = 0.08 * (hi - lo if hi > lo else abs(hi) + 1.0)
    ax.set_ylim(lo - pad, hi + pad)
    ax.yaxis.set_major_formatter(FuncFormatter(_plain))
    _label(ax, "", r"$S_K$")
    outside_legend(ax)
    # Lower panel: distance to the main term against the tail bound, and the remainder |count − M|.
    if main:
        d = [(a, abs(m - main[0])) for a, m, _ in pk if abs(m - main[0]) > 0]
        if d:
            ax2.semilogy(*zip(*d), "o", ms=3.2, color=PALETTE[0], label=r"$|S_K - M(n)|$ (midpoints)")
        if count is not None and count != main[0]:
            ax2.axhline(abs(count - main[0]), color=PALETTE[1], lw=1.2, ls=(0, (1, 1.5)),
                        label=r"$|E(n)| = |%s - M(n)|$" % ftex)
    tk = sorted((a, t) for a, t in tail_at.items() if t > 0)
    if tk:
        ax2.semilogy(*zip(*tk), "-", color=PALETTE[3], lw=1.3, label=r"tail bound $T_K \geq |\sum_{k>K}|$")
    else:
        ax2.text(0.5, 0.5, "no finite tail bound (the series does not converge absolutely at this weight)",
                 transform=ax2.transAxes, ha="center", va="center", fontsize=9, color=PALETTE[1])
    ax2.set_yscale("log")
    outside_legend(ax2)
    ax2.xaxis.set_major_locator(MaxNLocator(integer=True))
    xl = ax2.set_xlabel(r"$K$ (largest denominator $k$ of the major arcs)")
    xl.set_gid("xlabel")
    yl = ax2.set_ylabel(r"$|S_K - M(n)|$, $T_K$")
    yl.set_gid("ylabel2")
    title = r"Major arcs of $%s$" % ftex
    if count is not None:
        title += r" $= %s$" % "{:,}".format(count).replace(",", r"{,}")
    ax.set_title(title + r": partial sums, $K = %d,\dots,%d$" % (min(k), max(k)) if k else title)
    caption(fig, table.provenance, (main_json or {}).get("provenance"))
    save(fig, out)


# ------------------------------------------------------------------- scan --

def _primes_upto(n):
    return [p for p in range(2, n + 1) if all(p % q for q in range(2, int(p ** 0.5) + 1))]


def plot_scan(table, out):
    """Heat maps over (A, A'), one panel per t: the largest pinning prime Q of the
    NON-CONVERGENT pairs on each cell, on a discrete colour scale with one colour
    per prime (a prime is not a continuous quantity)."""
    import numpy as np
    for c in ("t", "A", "A2", "verdict", "Q"):
        if not table.find(c):
            raise PlotError("%s: no column %s (a scan table has t, A, A2, verdict, Q)" % (table.path, c))
    rows = [dict(zip(table.columns, r)) for r in table.rows]
    ts = sorted({int(r["t"]) for r in rows})
    M = max(max(int(r["A"]), int(r["A2"])) for r in rows)
    nc = [r for r in rows if r["verdict"] == "NON-CONVERGENT" and str(r["Q"]).strip()]
    qs = sorted({int(r["Q"]) for r in nc})
    primes = [p for p in _primes_upto(max(qs)) if p >= qs[0]] if qs else []
    index = {p: i for i, p in enumerate(primes)}
    ncols = min(3, len(ts))
    nrows = (len(ts) + ncols - 1) // ncols
    fig, axes = plt.subplots(nrows, ncols, figsize=Frame.size, dpi=Frame.dpi, squeeze=False)
    fig.subplots_adjust(left=0.08, right=0.84, top=0.88, bottom=0.17, wspace=0.30, hspace=0.38)
    cmap = ListedColormap([_ramp(i / max(1, len(primes) - 1)) for i in range(len(primes))]) if primes else None
    norm = BoundaryNorm([i - 0.5 for i in range(len(primes) + 1)], len(primes)) if primes else None
    im = None
    crosses = empty = 0
    flat = [ax for row in axes for ax in row]
    for ax, t in zip(flat, ts):
        grid = np.full((M, M), np.nan)
        other = np.zeros((M, M), dtype=bool)
        seen = np.zeros((M, M), dtype=bool)
        for r in rows:
            if int(r["t"]) != t:
                continue
            a, a2 = int(r["A"]) - 1, int(r["A2"]) - 1
            seen[a, a2] = True
            if r["verdict"] == "NON-CONVERGENT" and str(r["Q"]).strip():
                q = index[int(r["Q"])]
                grid[a, a2] = q if np.isnan(grid[a, a2]) else max(grid[a, a2], q)
            else:
                other[a, a2] = True
        empty += int((~seen).sum())
        ax.set_facecolor("#e9e4da")
        if primes:
            im = ax.imshow(grid, origin="lower", cmap=cmap, norm=norm, extent=(0.5, M + 0.5, 0.5, M + 0.5))
        for a, a2 in zip(*np.nonzero(other)):
            crosses += 1
            ax.plot(a2 + 1, a + 1, marker="x", ms=4, color=INK, mew=0.8)
        ax.set_xlim(0.5, M + 0.5)
        ax.set_ylim(0.5, M + 0.5)
        ax.set_title(r"$t = %d$" % t, fontsize=10)
        ax.set_xticks(range(1, M + 1))
        ax.set_yticks(range(1, M + 1))
        ax.tick_params(labelsize=7)
        ax.grid(False)
        for side in ("top", "right"):
            ax.spines[side].set_visible(True)
        xl = ax.set_xlabel(r"$A'$ (progression of $\mathrm{sc}_{%d}$)" % (2 * t - 1), fontsize=8)
        xl.set_gid("xlabel")
        yl = ax.set_ylabel(r"$A$ (progression of $c_{%d}$)" % t, fontsize=8)
        yl.set_gid("ylabel")
    for ax in flat[len(ts):]:
        ax.set_visible(False)
    if im is not None:
        cax = fig.add_axes([0.87, 0.17, 0.02, 0.71])
        cb = fig.colorbar(im, cax=cax, ticks=range(len(primes)))
        cb.ax.set_yticklabels([str(p) for p in primes])
        cb.set_label("largest prime $Q$ pinned (NON-CONVERGENT pairs)", fontsize=8)
        cb.ax.tick_params(labelsize=8)
    handles = []
    if crosses:
        handles.append(Line2D([], [], marker="x", ls="none", color=INK, label="some pair on the cell is not NON-CONVERGENT"))
    if empty:
        handles.append(Patch(facecolor="#e9e4da", label="no pair on the cell"))
    if handles:
        fig.legend(handles=handles, loc="lower left", bbox_to_anchor=(0.08, 0.05), ncol=2, fontsize=8)
    verdicts = {}
    for r in rows:
        verdicts[r["verdict"]] = verdicts.get(r["verdict"], 0) + 1
    fig.suptitle(r"Scan: $c_t(An+B)$ against $\mathrm{sc}_{2t-1}(A'n+B')$, $A, A' \leq %d$ (%s)" % (
        M, ", ".join("%d %s" % (v, k) for k, v in sorted(verdicts.items()))),
        x=0.08, ha="left", fontsize=10, color=INK)
    caption(fig, table.provenance)
    save(fig, out)


def _ramp(x):
    """The project's sequential ramp: pale ochre → teal → ink (x in [0, 1])."""
    stops = [(0.0, (0.93, 0.80, 0.45)), (0.5, (0.12, 0.44, 0.55)), (1.0, (0.15, 0.20, 0.24))]
    for (x0, c0), (x1, c1) in zip(stops, stops[1:]):
        if x <= x1:
            u = (x - x0) / (x1 - x0) if x1 > x0 else 0.0
            return tuple(a + u * (b - a) for a, b in zip(c0, c1))
    return stops[-1][1]


# -------------------------------------------------------------------- cli --

def _size(text):
    try:
        w, h = (float(x) for x in text.split(","))
    except ValueError:
        raise argparse.ArgumentTypeError("--size takes W,H in inches, e.g. 8,6 (got '%s')" % text)
    if not (1 <= w <= 40 and 1 <= h <= 40):
        raise argparse.ArgumentTypeError("--size: W and H must be between 1 and 40 inches (got '%s')" % text)
    return w, h


def _dpi(text):
    try:
        d = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError("--dpi takes a whole number (got '%s')" % text)
    if not 20 <= d <= 1200:
        raise argparse.ArgumentTypeError("--dpi must be between 20 and 1200 (got %d)" % d)
    return d


def main(argv=None):
    p = argparse.ArgumentParser(
        prog="plot.py", description="Standard plots of circlet output (PNG, SVG or PDF).",
        epilog="Input kinds: " + "; ".join("%s reads %s" % (k, v) for k, v in WHAT.items()) + ".")
    p.add_argument("kind", choices=["ratio", "remainder", "relerr", "arcs", "scan"])
    p.add_argument("input", help="CSV (with its '# circlet ...' line) or JSON written by circlet")
    p.add_argument("-o", "--output", required=True, action="append",
                   help="FILE.png, FILE.svg or FILE.pdf (repeat to write several from one run)")
    p.add_argument("--size", type=_size, default=FIGSIZE, metavar="W,H", help="figure size in inches (default 8,6)")
    p.add_argument("--dpi", type=_dpi, default=DPI, help="dots per inch (default 100)")
    p.add_argument("--cert", help="ratio: certificate JSON from 'circlet certify' (certified limit intervals)")
    p.add_argument("--over", metavar="G_COUNTS",
                   help="ratio: INPUT is 'circlet count F --ap A,B --to K' output and G_COUNTS the same for G; "
                        "the exact ratios are formed here")
    p.add_argument("--main", help="arcs: JSON from 'circlet main --json' (main-term ball and exact count)")
    a = p.parse_args(argv)
    Frame.size, Frame.dpi = a.size, a.dpi
    try:
        for out in a.output:
            check_output_name(out)
        try:
            table = load_table(a.input)
        except (OSError, ValueError) as e:
            raise PlotError("cannot read %s: %s" % (a.input, e))
        if a.over and a.kind != "ratio":
            raise PlotError("--over is for the ratio plot")
        check_input_kind(a.kind, table, over=bool(a.over))
        if a.over:
            try:
                table = ratio_from_counts(table, load_table(a.over))
            except (OSError, ValueError) as e:
                raise PlotError("cannot form the ratio with %s: %s" % (a.over, e))
        if len(table) == 0:
            raise PlotError("%s has no rows to plot" % a.input)
        try:
            cert = circlet_data_json(a.cert) if a.cert else None
            main_json = circlet_data_json(a.main) if a.main else None
        except (OSError, ValueError) as e:
            raise PlotError("cannot read %s: %s" % (a.cert or a.main, e))
        if cert is not None and "verdict" not in cert:
            raise PlotError("%s is not a certificate (no \"verdict\")" % a.cert)
        for out in a.output:
            if a.kind == "ratio":
                plot_ratio(table, out, cert)
            elif a.kind == "remainder":
                plot_remainder(table, out)
            elif a.kind == "relerr":
                plot_relerr(table, out)
            elif a.kind == "arcs":
                plot_arcs(table, out, main_json)
            else:
                plot_scan(table, out)
            print(out)
    except PlotError as e:
        print("plot.py: error: %s" % e, file=sys.stderr)
        return 2
    except KeyError as e:
        print("plot.py: error: %s" % e.args[0], file=sys.stderr)
        return 2
    return 0


def circlet_data_json(path):
    import json
    with open(path, encoding="utf-8") as fh:
        return json.load(fh)


load_json = circlet_data_json


if __name__ == "__main__":
    sys.exit(main())
