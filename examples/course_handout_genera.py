"""A teacher prepares a course handout on one discriminant with several genera.

Scenario
--------
For a class on genus theory the teacher wants one discriminant whose class group
has several genera *and* several classes in each genus, so that the students see
both what the genus characters separate and what they cannot: D = -260 = -4*65
(forms x^2 + 65y^2 and relatives).  The handout has

* a short genus table: the assigned characters, then each genus with its symbol and
  its reduced forms, and which small primes each genus represents;
* the full worked class group (formkit.explain_class_group, Markdown): the reduced
  forms, the structure, and the class table with orders, discrete logarithms and
  genus characters, with the checks of genus theory;
* one worked composition inside the principal genus (a square, as Gauss's theorem
  says every class of the principal genus is).

Run:  python examples/course_handout_genera.py [D] [--tex FILE]
With --tex the class-group part is also written as a complete LaTeX document.
"""

from __future__ import annotations

import sys

from formkit import class_group, explain_class_group, explain_composition
from formkit.classgroups.genus import genera
from formkit.representation.prime_decision import primes_up_to, represents_prime


def genus_table(D: int) -> str:
    P = genera(D)
    G = class_group(D)
    lines = [
        f"# Handout: genera of discriminant {D}",
        "",
        f"Cl({D}) = {G.structure} has {G.order} classes; the assigned characters "
        f"{', '.join(c.name for c in P.characters)} give {P.count} genera of {G.order // P.count} classes each.",
        "",
        "| genus | symbol | reduced forms | primes p < 200 represented |",
        "|---|---|---|---|",
    ]
    small = primes_up_to(200)
    for i, g in enumerate(P.genera, 1):
        label = "principal" if g.is_principal else str(i)
        symbol = "(" + ", ".join(f"{s:+d}" for s in g.symbol) + ")"
        forms = ", ".join(str(f.to_list()) for f in g.forms)
        primes = sorted({p for f in g.forms for p in small if represents_prime(f, p)})
        lines.append(f"| {label} | {symbol} | {forms} | {', '.join(map(str, primes))} |")
    lines.append("")
    lines.append(
        "The symbol only tells the genus: the two forms of one genus represent the same residues "
        f"modulo {abs(D)}, yet different primes."
    )
    return "\n".join(lines)


def main(argv: list[str]) -> int:
    D = -260
    tex_file = None
    args = list(argv)
    if "--tex" in args:
        i = args.index("--tex")
        tex_file = args[i + 1]
        del args[i : i + 2]
    if args:
        D = int(args[0])
    print(genus_table(D))
    print()
    print(explain_class_group(D, format="md"))
    G = class_group(D)
    # a non-trivial square: the square of a generator of the largest cyclic factor
    g = G.generators[-1]
    print(explain_composition(g.form, g.form, format="md"))
    if tex_file:
        with open(tex_file, "w", encoding="ascii") as fh:
            fh.write(explain_class_group(D, format="tex"))
        print(f"LaTeX version of the class group written to {tex_file}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
