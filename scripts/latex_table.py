#!/usr/bin/python3
"""LaTeX (booktabs) tables from circlet output, for papers.

    scripts/latex_table.py verdicts SCAN.csv [-o FILE.tex]
        verdicts of a scan per t (DIR/scan.csv of `circlet scan`)
    scripts/latex_table.py values TABLE.csv [--rows N,N,...] [-o FILE.tex]
        n, count, main term M(n) and remainder E(n) from `circlet main --to`
        or `circlet remainder` output (all rows, or the rows with the given n)
    scripts/latex_table.py relations CERT.json [CERT.json ...] [-o FILE.tex]
        the statements proved by certificates (`circlet certify -o`, each
        checked with `circlet verify`): a constant limit, or two limit points

The output is a `table` environment with `\\toprule`, `\\midrule`,
`\\bottomrule` (load `\\usepackage{booktabs}`), a caption naming the command
that made the data (from its provenance) and a `\\label`. Exact integers and
rationals are printed exactly ($\\frac{p}{q}$); Arb balls as $m \\pm r$ with
the digits circlet wrote; certified intervals as [lo, hi], their exact ends rounded outwards to six
significant digits. Nothing else is rounded here.
Exit status 2 with one line `latex_table.py: error: ...` on bad input.
"""
import argparse
import json
import math
import os
import re
import sys
from fractions import Fraction

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import circlet_data as cd  # noqa: E402


class TableError(Exception):
    pass


_SPECIAL = {"&": r"\&", "%": r"\%", "$": r"\$", "#": r"\#", "_": r"\_", "{": r"\{", "}": r"\}",
            "~": r"\textasciitilde{}", "^": r"\textasciicircum{}", "\\": r"\textbackslash{}"}


def tex_text(s):
    """Plain text with LaTeX's special characters escaped."""
    return "".join(_SPECIAL.get(ch, ch) for ch in str(s))


def tex_integer(s):
    """An exact integer, thin spaces every three digits: 14\\,180\\,606."""
    s = str(s).strip()
    sign, digits = ("-", s[1:]) if s.startswith("-") else ("", s)
    groups = []
    while len(digits) > 3:
        groups.insert(0, digits[-3:])
        digits = digits[:-3]
    groups.insert(0, digits)
    return "$%s%s$" % ("-" if sign else "", r"\,".join(groups))


def tex_number(s):
    """An exact value ($\\frac{p}{q}$), a ball ($m \\pm r$), or a decimal; '' stays empty."""
    s = str(s).strip()
    if s in ("", "undefined"):
        return "" if s == "" else r"\textit{undefined}"
    if s in ("inf", "[+/- inf]"):
        return r"$\infty$" if s == "inf" else r"$\pm\infty$"
    m = re.fullmatch(r"\[\s*([^\s\]]+)\s*\+/-\s*([^\s\]]+)\s*\]", s)
    if m:
        return "$%s \\pm %s$" % (_tex_decimal(m.group(1)), _tex_decimal(m.group(2)))
    m = re.fullmatch(r"\[\s*\+/-\s*([^\s\]]+)\s*\]", s)
    if m:
        return "$0 \\pm %s$" % _tex_decimal(m.group(1))
    m = re.fullmatch(r"(-?)(\d+)/(\d+)", s)
    if m:
        return "$%s\\frac{%s}{%s}$" % (m.group(1), m.group(2), m.group(3))
    if re.fullmatch(r"-?\d+", s):
        return tex_integer(s)
    if re.fullmatch(r"[-+]?\d*\.?\d+([eE][-+]?\d+)?", s):
        return "$%s$" % _tex_decimal(s)
    return tex_text(s)


def _tex_decimal(s):
    m = re.fullmatch(r"([-+]?\d*\.?\d*)[eE]([-+]?\d+)", s)
    if m:
        return r"%s \cdot 10^{%d}" % (m.group(1), int(m.group(2)))
    return s


def tex_family(name, arg="n"):
    m = re.fullmatch(r"(c|sc|sq)(\d+)", str(name))
    if not m:
        return tex_text(name)
    head = {"c": "c_{%s}", "sc": r"\mathrm{sc}_{%s}", "sq": "r_{%s}"}[m.group(1)] % m.group(2)
    return "%s(%s)" % (head, arg)


def tex_progression(ap):
    if isinstance(ap, dict):
        a, b = int(ap.get("A", 1)), int(ap.get("B", 0))
    else:
        a, b = (int(x) for x in str(ap).split(","))
    s = "n" if a == 1 else "%dn" % a
    return s if b == 0 else "%s+%d" % (s, b)


def table(columns, rows, caption, label, align=None):
    """A booktabs table environment."""
    align = align or "l" + "r" * (len(columns) - 1)
    out = ["\\begin{table}[ht]", "\\centering", "\\begin{tabular}{%s}" % align, "\\toprule",
           " & ".join(columns) + " \\\\", "\\midrule"]
    for r in rows:
        out.append(" & ".join(r) + " \\\\")
    out += ["\\bottomrule", "\\end{tabular}", "\\caption{%s}" % caption, "\\label{%s}" % label,
            "\\end{table}"]
    return "\n".join(out) + "\n"


def made_by(prov):
    cmd = (prov or {}).get("command", "")
    return (" Made by \\texttt{%s}" % tex_text(cmd).replace("--", "-{}-") + (" (circlet %s)" % tex_text(prov.get("version", ""))
                                                        if prov.get("version") else "") + ".") if cmd else ""


# ------------------------------------------------------------------ kinds --

VERDICTS = ["NON-CONVERGENT", "CONSTANT", "UNDECIDED", "PROPORTIONAL", "NOT-PROPORTIONAL", "BOTH-VANISH"]


def verdicts_table(path):
    df, prov = cd.read_table(path)
    for c in ("t", "verdict"):
        if c not in df.columns:
            raise TableError("%s: not a scan table (no column %s)" % (path, c))
    present = [v for v in VERDICTS if (df["verdict"] == v).any()]
    present += sorted(set(df["verdict"]) - set(present))
    rows = []
    for t in sorted(df["t"].unique(), key=int):
        s = df[df["t"] == t]
        rows.append(["$%s$" % t] + ["$%d$" % int((s["verdict"] == v).sum()) for v in present]
                    + ["$%d$" % len(s)])
    rows.append([r"all"] + ["$%d$" % int((df["verdict"] == v).sum()) for v in present] + ["$%d$" % len(df)])
    M = max(int(x) for x in list(df["A"]) + list(df["A2"])) if "A" in df.columns else None
    cap = "Verdicts for $c_t(An+B)$ against $\\mathrm{sc}_{2t-1}(A'n+B')$"
    if M:
        cap += ", $1 \\le A, A' \\le %d$" % M
    cap += "." + made_by(prov)
    cols = ["$t$"] + [tex_text(v) for v in present] + ["pairs"]
    text = table(cols, rows[:-1] + [rows[-1]], cap, "tab:circlet-verdicts")
    # A rule before the total row.
    lines = text.split("\n")
    total_at = max(i for i, l in enumerate(lines) if l.startswith("all &"))
    lines.insert(total_at, "\\midrule")
    return "\n".join(lines)


def values_table(path, wanted=None):
    df, prov = cd.read_table(path)
    if "count" not in df.columns or "n" not in df.columns:
        raise TableError("%s: not a main-term table (needs n and count: `circlet main --to` or `circlet remainder`)" % path)
    main = next((c for c in ("main_term_exact", "main") if c in df.columns), None)
    ball = "main_term" if "main_term" in df.columns else None
    rem = next((c for c in ("remainder_exact", "remainder") if c in df.columns), None)
    if main is None and ball is None:
        raise TableError("%s: no main-term column" % path)
    if wanted:
        want = {str(n) for n in wanted}
        df = df[df["n"].isin(want)]
        missing = want - set(df["n"])
        if missing:
            raise TableError("%s: no row with n = %s" % (path, ", ".join(sorted(missing, key=int))))
    pos, _ = _command_parts(prov)
    fam = next((p for p in pos if re.fullmatch(r"(c|sc|sq)\d+", p)), None)
    fn = tex_family(fam) if fam else "F(n)"
    rows = []
    for _, r in df.iterrows():
        m = r[main] if main and r[main] != "" else (r[ball] if ball else "")
        e = r[rem] if rem and r[rem] != "" else (r["remainder"] if "remainder" in df.columns else "")
        rows.append([tex_integer(r["n"]), tex_integer(r["count"]), tex_number(m), tex_number(e)])
    cols = ["$n$", "$%s$" % fn, "$M(n)$", "$E(n) = %s - M(n)$" % fn]
    cap = ("Exact counts, circle-method main terms and remainders for $%s$; exact rationals where the main "
           "term is exact, otherwise Arb balls $m \\pm r$ containing the value." % fn) + made_by(prov)
    return table(cols, rows, cap, "tab:circlet-values-%s" % (fam or "F"))


def _command_parts(prov):
    toks = (prov or {}).get("command", "").split()
    return [t for t in toks if not t.startswith("-")], toks


def exact_interval(ball):
    """(lo, hi) as Fractions from a certificate ball {"mid": "m*2^e", "rad": "m*2^e"}: exact."""
    mid, rad = cd.exact(ball["mid"]), cd.exact(ball["rad"])
    return Fraction(mid) - Fraction(rad), Fraction(mid) + Fraction(rad)


def round_sig(q, digits, down):
    """q rounded to `digits` significant decimal digits, downwards or upwards (outward rounding)."""
    q = Fraction(q)
    if q == 0:
        return "0"
    e = math.floor(math.log10(abs(float(q)))) - digits + 1
    scale = Fraction(10) ** e
    k = q / scale
    k = math.floor(k) if down else math.ceil(k)
    if e >= 0:
        return str(k * 10 ** e)
    s = str(abs(k)).rjust(-e + 1, "0")
    return ("-" if k < 0 else "") + s[:e] + "." + s[e:]


def relations_table(paths):
    rows = []
    provs = []
    for path in paths:
        try:
            with open(path, encoding="utf-8") as f:
                c = json.load(f)
        except (OSError, ValueError) as e:
            raise TableError("cannot read %s: %s" % (path, e))
        if not isinstance(c, dict) or "verdict" not in c:
            raise TableError("%s is not a certificate (no \"verdict\")" % path)
        F = tex_family(c["F"], tex_progression(c.get("ap", "1,0")))
        G = tex_family(c["G"], tex_progression(c.get("ap2", "1,0")))
        v = c["verdict"]
        if v == "CONSTANT":
            k = c["constant"]
            stmt = "$%s / %s \\to %s$" % (F, G, tex_number(k["value"]).strip("$"))
            note = "an integer" if k.get("contains_integer") else "not an integer"
        elif v == "NON-CONVERGENT":
            M = c["modulus"]
            cls = c["classes"]
            ivs = []
            for cl in cls:
                lo, hi = exact_interval(cl["limit_interval"])
                ivs.append("n \\equiv %s \\pmod{%s}: [%s, %s]" % (cl["residue"], M, round_sig(lo, 6, down=True),
                                                                   round_sig(hi, 6, down=False)))
            stmt = "$%s / %s$ has two limit points" % (F, G)
            note = "$" + "$; $".join(ivs) + "$"
        else:
            stmt = "$%s / %s$: undecided" % (F, G)
            note = tex_text(c.get("reason", ""))
        rows.append([stmt, tex_text(v), note])
        provs.append(c.get("provenance", {}))
    cap = ("Statements proved by the certificates listed (re-check each with \\texttt{circlet verify}); "
           "interval ends are the certified balls' exact ends rounded outwards to six digits.")
    versions = sorted({p.get("version", "") for p in provs if p.get("version")})
    if versions:
        cap += " circlet %s." % ", ".join(versions)
    return table(["statement", "verdict", "certified detail"], rows, cap, "tab:circlet-relations", align="lll")


def main(argv=None):
    p = argparse.ArgumentParser(prog="latex_table.py", description="booktabs LaTeX tables from circlet output")
    p.add_argument("kind", choices=["verdicts", "values", "relations"])
    p.add_argument("inputs", nargs="+")
    p.add_argument("--rows", help="values: the n to include, e.g. 10,100,1000")
    p.add_argument("-o", "--output", help="write FILE.tex instead of standard output")
    a = p.parse_args(argv)
    try:
        if a.kind != "relations" and len(a.inputs) != 1:
            raise TableError("%s takes one input file" % a.kind)
        if a.kind == "verdicts":
            text = verdicts_table(a.inputs[0])
        elif a.kind == "values":
            wanted = [int(x) for x in a.rows.split(",")] if a.rows else None
            text = values_table(a.inputs[0], wanted)
        else:
            text = relations_table(a.inputs)
    except (TableError, OSError, ValueError) as e:
        print("latex_table.py: error: %s" % e, file=sys.stderr)
        return 2
    if a.output:
        with open(a.output, "w", encoding="utf-8") as f:
            f.write(text)
    else:
        sys.stdout.write(text)
    return 0


if __name__ == "__main__":
    sys.exit(main())
