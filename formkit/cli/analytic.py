"""Commands ``l-value``, ``epstein``, ``theta`` and ``critical-line``: the analytic side."""

from __future__ import annotations

import argparse

from ..core.parse import parse_integer
from ..core.quadratic_orders import parse_discriminant
from .conventions import add_limit_options, form_text, limit_of


def _digits(args: argparse.Namespace) -> int:
    from .conventions import CommandError

    digits = parse_integer(args.digits, "--digits")  # a ParseError names the syntax or the size bound
    if digits < 1:
        raise CommandError(f"--digits must be a positive integer, not {args.digits!r}")
    return digits


def _value_lines(v, name: str) -> list[str]:
    lines = [f"{name} = {v.text()}"]
    if v.exact is not None:
        lines.append(f"  exact rational value, from the {v.method}")
    else:
        lines.append(f"  certified: |error| <= {v.error_bound:.1e}  ({v.digits} significant digits)")
        lines.append(f"  method: {v.method}")
    return lines


def _identity_lines(r) -> list[str]:
    at = "" if r.statement.startswith("Chowla") else f", s = {r.s}"
    plural = "class" if r.class_number == 1 else "classes"
    return [
        f"{r.statement}   (D = {r.discriminant}{at}, {r.class_number} {plural})",
        f"  by the classes: {r.left.text()}   (|error| <= {r.left.error_bound:.1e})",
        f"  by the formula: {r.right.text()}   (|error| <= {r.right.error_bound:.1e})",
        f"  the two certified values {'agree' if r.agrees else 'DISAGREE'}; classes: {r.provenance}",
    ]


def _ideal_bound(args: argparse.Namespace) -> int | None:
    return None if args.bound is None else parse_integer(args.bound, "--bound")


def _cmd_l_value(args: argparse.Namespace) -> int:
    from ..analytic.l_series import l_series, quadratic_field_zeta
    from ..classgroups.class_series import class_character_l_series, genus_character_l_series
    from ..core.discriminants import is_fundamental_discriminant
    from .conventions import CommandError, emit

    D = parse_discriminant(args.discriminant, "discriminant")
    digits = _digits(args)
    chosen = [x for x in (args.class_character, args.genus, args.field_zeta or None) if x is not None]
    if len(chosen) > 1:
        raise CommandError("choose at most one of --class-character, --genus and --field-zeta")
    bound = _ideal_bound(args)
    if bound is not None and not (D > 0 and (args.genus is not None or args.class_character is not None)):
        raise CommandError("--bound sets the ideal norms summed for D > 0 with --genus or --class-character")
    if args.genus is not None:
        d1 = parse_integer(args.genus, "--genus")
        if D > 0:
            from ..classgroups.partial_zeta import real_genus_character_l_series

            r = real_genus_character_l_series(D, d1, args.s, bound=bound, digits=digits)
        else:  # fundamental or not: an order's D is handed to order_series
            r = genus_character_l_series(D, d1, args.s, digits=digits)
        payload = {"kind": "genus_character", **r.to_dict()}
        lines = _identity_lines(r)
        if not is_fundamental_discriminant(D):
            payload["local_factors"] = _factor_dicts(D, genus=d1)
            lines += _factor_lines(payload["local_factors"])
        emit(args, payload, lambda: "\n".join(lines))
        return 0
    if args.class_character is not None:
        try:
            k = [int(t) for t in args.class_character.replace(" ", "").split(",") if t != ""]
        except ValueError as exc:
            raise CommandError(
                f"--class-character takes exponents such as 1 or 1,0, not {args.class_character!r}"
            ) from exc
        if not is_fundamental_discriminant(D):
            return _ring_class(args, D, k, bound, digits)
        if D > 0:
            from ..classgroups.partial_zeta import real_class_character_l_series

            v = real_class_character_l_series(D, k, args.s, bound=bound, digits=digits)
        else:
            v = class_character_l_series(D, k, args.s, digits=digits)
        name = v.quantity.replace("L(s, ψ)", f"L({v.s}, ψ)")
        payload = {"kind": "class_character", "discriminant": D, "character": k, **v.to_dict()}
    elif args.field_zeta:
        v = quadratic_field_zeta(D, args.s, digits=digits)
        name = v.quantity.replace("ζ_K(s)", f"ζ_K({v.s})", 1)
        payload = {"kind": "field_zeta", "discriminant": D, "character": None, **v.to_dict()}
    else:
        v = l_series(D, args.s, digits=digits)
        name = f"L({v.s}, χ_{D})"
        payload = {"kind": "kronecker_character", "discriminant": D, "character": None, **v.to_dict()}
    emit(args, payload, lambda: "\n".join(_value_lines(v, name)))
    return 0


def _factor_dicts(D: int, character=None, genus: int | None = None) -> list[dict]:
    from ..classgroups.conductor_factors import _local_factors, order_local_factors

    if genus is None:
        return [e.to_dict() for e in order_local_factors(D, character)]
    from fractions import Fraction

    from ..classgroups.genus import value_prime_to
    from ..core.arith import kronecker

    def phase(x) -> Fraction:
        m, _, _ = value_prime_to(x.form, D)
        return Fraction(0) if kronecker(genus, m) == 1 else Fraction(1, 2)

    return [e.to_dict() for e in _local_factors(D, phase)]


def _factor_lines(factors: list[dict]) -> list[str]:
    lines = ["  factors at the primes p | f (X = p^-s; c = exponent of p in the conductor of the character):"]
    for e in factors:
        lines.append(
            f"    p = {e['prime']} (p^{e['exponent']} || f, c = {e['conductor_exponent']}): e_{e['prime']} = {e['factor']}"
        )
    return lines


def _ring_class(args: argparse.Namespace, D: int, k: list[int], bound: int | None, digits: int) -> int:
    from ..classgroups.order_series import ring_class_l_series
    from .conventions import emit

    r = ring_class_l_series(D, k, args.s, digits=digits, bound=bound)
    payload = {
        "kind": "class_character",
        "discriminant": D,
        "character": k,
        **r.invertible.to_dict(),
        "character_conductor": r.conductor,
        "primitive": r.primitive.to_dict(),
        "local_factors": [e.to_dict() for e in r.factors],
        "provenance": r.provenance,
    }

    def human() -> str:
        label = ", ".join(str(x) for x in k)
        lines = _value_lines(
            r.invertible, f"L_O({r.s}, psi) over the invertible ideals of the order, psi = ({label})"
        )
        lines.append(
            f"  psi is a ring class character of conductor {r.conductor}: it factors through "
            f"Cl{'+' if D > 0 else ''}({r.character_discriminant})"
        )
        lines += _factor_lines(payload["local_factors"])
        lines += _value_lines(r.primitive, f"L({r.s}, psi) (primitive) = L_O/prod e_p")
        lines.append(f"  classes: {r.provenance}")
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_epstein(args: argparse.Namespace) -> int:
    from ..analytic.epstein import epstein_zeta, kronecker_limit
    from ..classgroups.class_series import chowla_selberg, class_zeta_sum
    from ..core.forms import as_form
    from .conventions import CommandError, emit

    digits = _digits(args)
    bound = _ideal_bound(args)
    if args.classes or args.chowla_selberg:
        D = parse_discriminant(args.target, "D")
        if bound is not None and not (args.classes and D > 0):
            raise CommandError("--bound sets the ideal norms summed for --classes with D > 0")
        if args.classes and D > 0:
            return _real_classes(args, D, bound, digits)
        if args.chowla_selberg:
            if args.s is not None:
                raise CommandError("--chowla-selberg takes no S")
            r = chowla_selberg(D, digits=digits)
        else:
            if args.s is None:
                raise CommandError("--classes needs S (the point s)")
            r = class_zeta_sum(D, args.s, digits=digits)  # an order's D is handed to order_zeta_sum
        payload = {"kind": "identity", **r.to_dict()}
        lines = _identity_lines(r)
        if r.statement.startswith("Σ_C Z_C(s)") and "e_" in r.statement:
            payload["local_factors"] = _factor_dicts(D)
            lines += _factor_lines(payload["local_factors"])
        emit(args, payload, lambda: "\n".join(lines))
        return 0
    Q = as_form(args.target)
    if args.limit_formula:
        if args.s is not None:
            raise CommandError("--limit-formula is about s = 1 and takes no S")
        k = kronecker_limit(Q, digits=digits)

        def human() -> str:
            tau = k.tau
            return "\n".join(
                [
                    f"Kronecker's first limit formula for Q = {form_text(Q)} (D = {Q.discriminant}):",
                    f"  Z_Q(s) = R/(s - 1) + C + O(s - 1) with R = 2*pi/sqrt({-Q.discriminant}) = {k.residue.text()}",
                    f"  C = {k.constant_term.text()}   (through eta(tau_Q), tau_Q = {float(tau.real):.6g} + "
                    f"{float(tau.imag):.6g}i, |eta(tau_Q)| = {abs(complex(k.eta.value)):.15g})",
                    f"  C from the Chowla-Selberg expansion: {k.constant_term_series.text()} "
                    f"({'agrees' if k.agrees else 'DISAGREES'})",
                ]
            )

        emit(args, {"kind": "limit_formula", **k.to_dict()}, human)
        return 0
    if args.s is None:
        raise CommandError("epstein needs S (the point s), or --limit-formula")
    v = epstein_zeta(Q, args.s, digits=digits)
    payload = {"kind": "epstein", **v.to_dict()}
    emit(args, payload, lambda: "\n".join(_value_lines(v, f"Z_Q({v.s}) for Q = {form_text(Q)}")))
    return 0


def _real_classes(args: argparse.Namespace, D: int, bound: int | None, digits: int) -> int:
    from ..classgroups.partial_zeta import partial_zeta_values, real_class_zeta_sum
    from ..core.discriminants import is_fundamental_discriminant
    from .conventions import CommandError, emit

    if args.s is None:
        raise CommandError("--classes needs S (the point s)")
    z = partial_zeta_values(D, args.s, bound=bound, digits=digits)
    r = real_class_zeta_sum(D, args.s, digits=digits, values=z)  # an order's D goes to order_zeta_sum
    info = z.to_dict()
    payload = {
        "kind": "partial_zeta",
        "discriminant": D,
        "s": str(z.s),
        "bound": z.bound,
        "tail_bound": info["tail_bound"],
        "partial_zeta": info["classes"],
        "provenance": z.provenance,
    }
    payload.update({k: v for k, v in r.to_dict().items() if k not in payload})
    if not is_fundamental_discriminant(D):
        payload["local_factors"] = _factor_dicts(D)

    def human() -> str:
        lines = [
            f"partial zeta functions zeta(s, C) = sum of N(a)^-s over the invertible ideals a of the narrow class C, "
            f"D = {D}, s = {z.s}:",
            (
                f"  direct sum over the ideals of norm <= {z.bound}, the rest bounded by {z.tail_bound:.1e} "
                "(explicit tail bound); ball arithmetic, unconditional"
                if bound is not None
                else f"  analytic continuation: functional equation of the class character L-series and a smoothed "
                f"sum over the ideals of norm <= {z.bound} (explicit cuts, checked at two values of t); "
                "ball arithmetic, unconditional"
            ),
        ]
        for f, v, n in zip(z.classes, z.values, z.ideal_counts):
            lines.append(
                f"  C = [{form_text(f)}]: {v.text():<22} (|error| <= {v.error_bound:.1e}; {n} primitive ideals)"
            )
        lines.extend(_identity_lines(r))
        if "local_factors" in payload:
            lines.extend(_factor_lines(payload["local_factors"]))
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def _cmd_theta(args: argparse.Namespace) -> int:
    from ..analytic.theta_series import theta_series
    from ..core.forms import as_form
    from .conventions import CommandError, emit

    Q = as_form(args.form)
    N = parse_integer(args.bound, "--bound")
    show = limit_of(args)
    if show is None:  # --all
        show = N
    if args.output and not args.genus:
        raise CommandError("--output draws r_Q(n) against the genus average: give --genus too")
    if args.eigenforms:
        if args.genus:
            raise CommandError("--eigenforms and --genus are two views of theta: give one of them")
        return _theta_eigenforms(args, Q, N, show)
    if not args.genus:
        import numpy as np

        th = theta_series(Q, N)
        payload = {"kind": "theta", **th.to_dict(limit=show)}

        def human() -> str:
            m = min(N, show)
            nonzero = int(np.count_nonzero(th.coefficients[1:]))
            lines = [
                f"theta series of Q = {form_text(Q)} (D = {Q.discriminant}) up to q^{N}: exact counts r_Q(n) "
                f"of (x, y) with Q(x, y) = n",
                f"  r_Q(n) > 0 for {nonzero} of the n in 1..{N}; first coefficients (n: r_Q(n)):",
            ]
            row = [f"{n}: {th[n]}" for n in range(m + 1)]
            for i in range(0, len(row), 10):
                lines.append("  " + ", ".join(row[i : i + 10]))
            return "\n".join(lines)

        emit(args, payload, human)
        return 0
    from ..classgroups.genus_theta import theta_decomposition

    t = theta_decomposition(Q, N)
    if args.output:
        from ..graphs.series_pictures import genus_average_picture

        try:
            genus_average_picture(t, args.output)
        except OSError as exc:
            raise CommandError(f"cannot write {args.output!r}: {exc.strerror}") from exc
    payload = {"kind": "theta_decomposition", "output": args.output, **t.to_dict(limit=show)}

    def human_genus() -> str:
        m = min(N, show)
        source = (
            "the genus characters"
            if "genus characters" in t.eisenstein_method
            else "Siegel's local densities"
        )
        siegel = {
            True: f"equals the Eisenstein series from {source} (checked exactly up to q^{t.eisenstein_bound})",
            False: f"DIFFERS from the Eisenstein series from {source}",
            None: "(no Eisenstein comparison)",
        }[t.siegel_agrees]
        lines = [
            f"Q = {form_text(Q)} (D = {Q.discriminant}); its genus has {len(t.genus_forms)} class"
            f"{'es' if len(t.genus_forms) != 1 else ''}: " + ", ".join(form_text(f) for f in t.genus_forms),
            f"Siegel's weighted average of theta over the genus (weights 1/|Aut|, |Aut| = "
            f"{sorted(set(t.automorphism_orders))}) {siegel}",
            f"{'n':>5}  {'r_Q(n)':>7}  {'genus average':>14}  {'cusp part':>10}",
        ]
        for n in range(m + 1):
            lines.append(
                f"{n:>5}  {t.theta[n]:>7}  {t.genus_average(n)!s:>14}  {t.cusp_coefficient(n)!s:>10}"
            )
        lines.append(f"classes: {t.provenance}")
        if args.output:
            lines.append(f"wrote the picture to {args.output}")
        return "\n".join(lines)

    emit(args, payload, human_genus)
    return 0


def _theta_eigenforms(args: argparse.Namespace, Q, N: int, show: int) -> int:
    from ..classgroups.hecke_theta import hecke_decomposition
    from .conventions import emit

    h = hecke_decomposition(Q, N)
    payload = {"kind": "hecke_eigenforms", **h.to_dict(limit=show)}

    def poly_line(factors) -> str:
        return " * ".join(
            f"({fac['text']})" + (f"^{fac['multiplicity']}" if fac["multiplicity"] > 1 else "")
            for fac in factors
        )

    def human() -> str:
        m = min(N, show)
        d = h.to_dict(limit=show)
        lines = [
            f"Q = {form_text(Q)} (D = {h.discriminant}): the theta series of the classes of D span a space of "
            f"dimension {h.span_dimension}; the cusp parts theta_C - (genus average) span {h.cusp_dimension}",
            f"Hecke operators T_p (U_p for p | D) on q-expansions, each matrix proved by Sturm's bound "
            f"(coefficients up to q^{h.sturm_bound} fix a weight-1 form on Gamma_0({-h.discriminant}))",
            "characteristic polynomials on the cusp span:",
        ]
        for p, factors in d["hecke_polynomials"].items():
            lines.append(
                f"  p = {p:>3}{' (U_p)' if h.discriminant % int(p) == 0 else '       '}  {poly_line(factors)}"
            )
        if h.cusp_dimension == 0:
            lines.append("the genus of Q has one class: theta_Q is its genus average, the cusp part is 0")
        for i, f in enumerate(h.eigenforms, 1):
            where = (
                "Q"
                if f.degree == 1
                else f"Q(a), {f.to_dict()['field_polynomial_text'].replace('x', 'a')} = 0"
            )
            lines.append(f"eigenform f{i} over {where}, normalised a({f.normalised_at}) = 1:")
            lines.append("  " + ", ".join(f"{n}: {f.coefficient_text(n)}" for n in range(1, m + 1)))
            lines.append(
                "  eigenvalues: "
                + ", ".join(
                    f"{'U' if h.discriminant % p == 0 else 'T'}_{p}: {_poly_text(v, 'a')}"
                    for p, v in f.eigenvalues.items()
                )
            )
        if h.unsplit:
            lines.append(
                "not split by these operators (eigenspaces of dimension > 1, e.g. old forms): "
                + ", ".join(f"({_poly_text(g)})^{e}" for g, e in h.unsplit)
            )
        check = {
            True: f"the sum of the traces equals theta_Q - theta_G up to q^{N} (checked exactly)",
            False: "the sum of the traces DIFFERS from theta_Q - theta_G",
            None: "no reconstruction: part of the cusp span is unsplit",
        }[h.reconstructs]
        if h.eigenforms:
            terms = [
                f"({f.component_text})*f{i}" if f.degree == 1 else f"Tr_{{Q(a)/Q}}(({f.component_text})*f{i})"
                for i, f in enumerate(h.eigenforms, 1)
            ]
            lines.append("theta_Q - theta_G = " + " + ".join(terms))
        if h.cusp_dimension:
            lines.append(check)
        lines.append(
            "cusp part theta_Q - theta_G: " + ", ".join(f"{n}: {h.cusp_part[n]}" for n in range(m + 1))
        )
        lines.append(f"classes: {h.provenance}")
        return "\n".join(lines)

    from ..classgroups.hecke_theta import _poly_text

    emit(args, payload, human)
    return 0


def _cmd_critical_line(args: argparse.Namespace) -> int:
    from ..analytic.l_series import critical_line_samples
    from .conventions import CommandError, emit

    # D = 1 (the Riemann zeta function) is no discriminant of a quadratic order
    D = 1 if args.discriminant.strip() == "1" else parse_discriminant(args.discriminant, "discriminant")
    points = parse_integer(args.points, "--points")
    c = critical_line_samples(D, args.height, points=points, digits=_digits(args))
    if args.output:
        from ..graphs.series_pictures import critical_line_picture

        try:
            critical_line_picture(c, args.output)
        except OSError as exc:
            raise CommandError(f"cannot write {args.output!r}: {exc.strerror}") from exc
    payload = {"output": args.output, **c.to_dict()}
    name = "zeta(1/2 + it)" if c.discriminant == 1 else f"L(1/2 + it, chi_{c.discriminant})"

    def human() -> str:
        i = max(range(len(c.values)), key=lambda j: c.values[j])
        lines = [
            f"|{name}| at {len(c.values)} points 0 <= t <= {c.heights[-1]:g} (each certified to "
            f"{c.digits} digits; largest error {c.error_bound:.1e})",
            f"  largest sampled value {c.values[i]:.10g} at t = {c.heights[i]:.6g}",
        ]
        if args.output:
            lines.append(f"wrote the picture to {args.output}")
        else:
            step = max(1, len(c.values) // 20)
            lines.extend(
                f"  t = {c.heights[j]:>10.5g}   |L| = {c.values[j]:.10g}"
                for j in range(0, len(c.values), step)
            )
        return "\n".join(lines)

    emit(args, payload, human)
    return 0


def register(sub: argparse._SubParsersAction, parent: argparse.ArgumentParser) -> None:
    """Add the ``l-value``, ``epstein``, ``theta`` and ``critical-line`` commands."""
    raw = argparse.RawDescriptionHelpFormatter
    digits_help = "significant digits certified (default 30, at most 1000)"
    p = sub.add_parser(
        "l-value",
        parents=[parent],
        help="L(s, chi_D) at any complex s, certified; exact at s = 0, -1, -2, ...",
        description=(
            "The Dirichlet L-series L(s, chi_D) of the Kronecker character chi_D(n) = (D/n) at any complex s, "
            "by the functional equation and the incomplete-gamma series, in ball arithmetic with an explicit "
            "tail bound (unconditional); at s = 0, -1, -2, ... the exact rational value from generalised "
            "Bernoulli numbers. --field-zeta gives the Dedekind zeta function zeta(s) L(s, chi_dK) of K = Q(sqrt D); "
            "--class-character K1,K2,... the L-series of the character of Cl(D) sending the i-th "
            "generator of 'formkit group D' to exp(2 pi i K_i/n_i): for D < 0 as (1/w) sum over classes of "
            "psi(C) Z_C(s) (Epstein zeta functions, any s); for D > 0 as the sum of psi(C) zeta(s, C) over the "
            "narrow classes: at any complex s by the analytic continuation (Hecke's functional equation "
            "Lambda(s, psi) = Lambda(1 - s, conj psi) and a smoothed sum with K_0, explicit bounds), or with "
            "--bound X by direct summation over the ideals of norm <= X (real s > 1, explicit tail bound); "
            "--genus D1 the genus character for D = D1*D2, computed by the classes and as "
            "L(s, chi_D1) L(s, chi_D2). For an order (D = f^2 d_K, f > 1) the series by the classes runs over the "
            "invertible ideals of the order and differs from the L-series by a factor e_p(s), a polynomial in p^-s, at "
            "each prime p | f (printed); --class-character then also gives the conductor of the ring class character "
            "and its primitive L-series. s is written 2, -3, 0.5, 1/2 or 1/2+14.1347i. "
            "Python: formkit.l_series(D, s, digits=...), formkit.quadratic_field_zeta, "
            "formkit.class_character_l_series(D, [K1, ...], s), formkit.genus_character_l_series(D, D1, s), "
            "formkit.real_class_character_l_series, formkit.real_genus_character_l_series (D > 0)."
        ),
        epilog=(
            "examples:\n  formkit l-value -23 1\n  formkit l-value -4 1/2+6i --digits 20\n"
            "  formkit l-value 5 -1\n  formkit l-value 5 2 --field-zeta\n"
            "  formkit l-value -23 1 --class-character 1\n  formkit l-value -84 2 --genus -3\n"
            "  formkit l-value 229 3 --class-character 1 --bound 5000\n  formkit l-value 60 3 --genus 5 --bound 5000\n"
            "  formkit l-value -36 2 --genus -3\n  formkit l-value -176 3 --class-character 2"
        ),
        formatter_class=raw,
    )
    p.add_argument("discriminant", metavar="D", help="the discriminant of the character (e.g. -23, 5, 12)")
    p.add_argument("s", metavar="S", help="the point s: 2, -3, 0.5, 1/2 or 1/2+14.1347i")
    p.add_argument("--digits", default="30", help=digits_help)
    p.add_argument(
        "--field-zeta", action="store_true", help="the Dedekind zeta function of Q(sqrt D) instead"
    )
    p.add_argument(
        "--class-character", metavar="K1,K2,...", help="a character of Cl(D) (narrow for D > 0), by exponents"
    )
    p.add_argument("--genus", metavar="D1", help="the genus character of D = D1*D2 (D1 fundamental or 1)")
    p.add_argument(
        "--bound",
        metavar="X",
        help="D > 0: sum the partial zeta functions over the ideals of norm <= X (default 20000, at most 10^6)",
    )
    p.set_defaults(handler=_cmd_l_value)

    e = sub.add_parser(
        "epstein",
        parents=[parent],
        help="the Epstein zeta function Z_Q(s) of a positive definite form; limit formula; class sums",
        description=(
            "Z_Q(s) = sum over (x, y) != (0, 0) of Q(x, y)^(-s) for a positive definite form Q, at any s != 1, by "
            "the Chowla-Selberg expansion (zeta terms and a K-Bessel series with an explicit tail bound) in ball "
            "arithmetic. --limit-formula: the residue 2 pi/sqrt|D| and the constant term at s = 1 by Kronecker's "
            "first limit formula through Dedekind's eta at the root of Q, checked against the expansion. "
            "--classes: the target is a D < 0 and the sum of Z_C(s) over its classes is set beside "
            "w zeta(s) L(s, chi_D), times a factor e_p(s) (a polynomial in p^-s, printed) at each prime p | f for an order "
            "of conductor f > 1; for D > 0 (where the forms are indefinite and Z_Q is no sum) the partial zeta "
            "functions zeta(s, C) of the narrow ideal classes are given instead, at any complex s != 1 by the "
            "analytic continuation (functional equation of the class character L-series), or with --bound X "
            "summed directly over the ideals of norm <= X (real s > 1, explicit tail bound), and their sum is set beside "
            "zeta(s) L(s, chi_dK) (times the e_p(s) for an order). --chowla-selberg: both sides of the Chowla-Selberg formula for D < 0 (the product "
            "over classes of sqrt(Im tau) |eta(tau)|^2 and the Gamma-value product; a statement about CM points, "
            "so D > 0 is refused). "
            "Python: formkit.epstein_zeta(Q, s), formkit.kronecker_limit(Q), formkit.class_zeta_sum(D, s), "
            "formkit.chowla_selberg(D), formkit.partial_zeta_values(D, s), formkit.real_class_zeta_sum(D, s)."
        ),
        epilog=(
            "examples:\n  formkit epstein 1,0,1 2\n  formkit epstein 2,1,3 1/2+3i --digits 20\n"
            "  formkit epstein 1,1,1 --limit-formula\n  formkit epstein -23 2 --classes\n"
            "  formkit epstein -163 --chowla-selberg\n  formkit epstein 229 3 --classes --bound 5000\n"
            "  formkit epstein -63 3 --classes\n  formkit epstein 48 3 --classes --bound 2000"
        ),
        formatter_class=raw,
    )
    e.add_argument("target", metavar="Q_OR_D", help="a positive definite form (a,b,c), or D with --classes")
    e.add_argument("s", metavar="S", nargs="?", default=None, help="the point s (any complex s != 1)")
    e.add_argument("--digits", default="30", help=digits_help)
    mode = e.add_mutually_exclusive_group()
    mode.add_argument("--limit-formula", action="store_true", help="residue and constant term at s = 1")
    mode.add_argument(
        "--classes",
        action="store_true",
        help="sum over the classes of D against w times the Dedekind zeta function of Q(sqrt D)",
    )
    mode.add_argument(
        "--chowla-selberg", action="store_true", help="both sides of the Chowla-Selberg formula (D < 0)"
    )
    e.add_argument(
        "--bound",
        metavar="X",
        help="--classes with D > 0: ideals of norm <= X are summed (default 20000, at most 10^6)",
    )
    e.set_defaults(handler=_cmd_epstein)

    t = sub.add_parser(
        "theta",
        parents=[parent],
        help="theta series of a positive definite form; genus average (Siegel) and cusp part",
        description=(
            "The theta series sum r_Q(n) q^n of a positive definite form up to q^N, by an exact count of the "
            "lattice points of the ellipse Q <= N. --genus adds Siegel's weighted average over the genus of Q "
            "(classes by complete enumeration), its comparison with the Eisenstein series given by the genus "
            "characters (fundamental D), and the cusp part theta_Q - average; with --output FILE.png|svg also "
            "a picture of r_Q(n) against the genus average (needs matplotlib). --limit K prints the first K+1 "
            "coefficients (the computation goes to N). --eigenforms computes the Hecke operators T_p on the span "
            "of the theta series of all classes of D (exact q-expansions, proved by Sturm's bound), their "
            "characteristic polynomials, the simultaneous eigenforms over number fields Q(a), and theta_Q - "
            "(genus average) as a sum of traces of eigenforms (|D| <= 20000). "
            "Python: formkit.theta_series(Q, N), formkit.theta_decomposition(Q, N), "
            "formkit.hecke_decomposition(Q, N)."
        ),
        epilog=(
            "examples:\n  formkit theta 1,0,1 --bound 20\n  formkit theta 2,1,3 --bound 30 --genus\n"
            "  formkit theta 1,1,6 --bound 60 --genus --output cusp23.png\n"
            "  formkit theta 1,0,1 --bound 10^6 --limit 5\n"
            "  formkit theta 1,1,6 --bound 30 --eigenforms\n  formkit theta 1,1,12 --bound 20 --eigenforms"
        ),
        formatter_class=raw,
    )
    t.add_argument("form", help="a positive definite form: a,b,c or a polynomial such as 'x^2+xy+6y^2'")
    t.add_argument(
        "--bound", metavar="N", required=True, help="the last exponent N (at most 10^8; 2*10^6 with --genus)"
    )
    add_limit_options(t, "coefficients after the constant term in the text output", 20)
    t.add_argument("--genus", action="store_true", help="genus average, Eisenstein comparison and cusp part")
    t.add_argument("--output", "-o", metavar="FILE", help="with --genus: write a PNG/SVG picture")
    t.add_argument(
        "--eigenforms",
        action="store_true",
        help="the cusp part as a sum of Hecke eigenforms (Hecke operators on the theta series of D)",
    )
    t.set_defaults(handler=_cmd_theta)

    c = sub.add_parser(
        "critical-line",
        parents=[parent],
        help="|L(1/2 + it, chi_D)| for 0 <= t <= T, as numbers or a picture",
        description=(
            "Samples |L(1/2 + it, chi_D)| (D = 1: |zeta(1/2 + it)|) at equally spaced t in [0, T], each value "
            "certified to --digits digits (default 10); with --output FILE.png|svg a picture (needs "
            "matplotlib). Python: formkit.critical_line_samples(D, T, points=...)."
        ),
        epilog=(
            "examples:\n  formkit critical-line -4 --height 30 --points 60\n"
            "  formkit critical-line -23 --height 40 --output critical23.png\n"
            "  formkit critical-line 1 --height 50 --points 400 -o zeta.svg"
        ),
        formatter_class=raw,
    )
    c.add_argument("discriminant", metavar="D", help="the discriminant of chi_D, or 1 for zeta")
    c.add_argument("--height", metavar="T", required=True, help="the largest t")
    c.add_argument("--points", metavar="M", default="200", help="number of sample points (default 200)")
    c.add_argument("--digits", default="10", help="significant digits certified per value (default 10)")
    c.add_argument("--output", "-o", metavar="FILE", help="write a PNG/SVG picture")
    c.set_defaults(handler=_cmd_critical_line)


__all__ = ["register"]
