"""Analytic continuation of the partial zeta functions ζ(s, C) of real quadratic classes (D > 0).

:mod:`formkit.classgroups.narrow_class_zeta` sums ``ζ(s, C) = Σ_{𝔞 ∈ C} N(𝔞)^(−s)`` directly
for real ``s > 1``.  Here every narrow class character ``ψ`` of the order ``O`` of
discriminant ``D > 0`` (fundamental or not) gets its completed L-series and functional
equation, and a rapidly convergent smoothed sum gives ``L(s, ψ)`` and
``ζ(s, C) = (1/h⁺)·Σ_ψ ψ̄(C)·L(s, ψ)`` at every complex ``s`` (``s ≠ 1`` for ``ψ = 1``
and for ``ζ(s, C)``).

**Signature of ψ** (Hecke; Neukirch, *Algebraic Number Theory*, VII §8: a character of
the narrow class group is a Hecke character of finite conductor 1 whose infinity type is
``sgn(x₁)^δ·sgn(x₂)^δ``, the same δ at both real places because ``ψ((α)) = ψ((−α))``).
Let ``δ(ψ) = 0`` when ``ψ((α)) = 1`` for every ``α`` with ``N(α) < 0`` and ``δ(ψ) = 1``
when ``ψ((α)) = sign N(α)`` (the two cases, since ``ψ`` is trivial on ``(α)`` with
``α ≫ 0``); ``δ = 1`` is read off as ``ψ = −1`` on the class of the forms that represent
``−1`` (the class of the ideal ``(√D)``, trivial exactly when the fundamental unit has norm
``−1``).  With ``γ_δ(s) = Γ_R(s + δ)² = π^(−s−δ)·Γ((s + δ)/2)²``,

    Λ(s, ψ) = D^(s/2)·γ_δ(s)·L(s, ψ) = W(ψ)·Λ(1 − s, ψ̄),     W(ψ) = 1.

**Proof of W = 1** (Hecke's theta argument, done here for any order).  For an invertible
ideal ``𝔟`` (a lattice of covolume ``V = N𝔟·√D`` in ``R²``) Poisson summation applied to
``Σ_{α ∈ 𝔟} (αα')^δ·exp(−π(α²y₁ + α'²y₂))`` gives the factor ``(−i)^(2δ)/V`` and the
dual lattice ``𝔟* = (√D)^(−1)𝔟^(−1)`` (the codifferent of ``Z[ω]`` is ``(1/√D)·O``, and
``𝔟`` is invertible); the Mellin transform over ``(R_{>0})²`` modulo the totally positive
units (Hecke's unit integral) then gives
``Λ_δ(s, 𝔟) = (−1)^δ·Λ_δ(1 − s, 𝔟*)`` with ``Λ_δ(s, 𝔟) = V^s·γ_δ(s)·Σ_{α ∈ 𝔟/O^×}
sgn(Nα)^δ·|Nα|^(−s)``.  Summing ``ψ̄(𝔟)·Λ_δ(s, 𝔟)`` over the wide classes, the sign
``(−1)^δ`` cancels against ``ψ((√D)) = sign N(√D)^δ = (−1)^δ``, and what remains is
``Λ(1 − s, ψ̄)``: ``W(ψ) = 1`` for every character, real or complex.  (For a non-maximal
order this is consistent with the factors of :mod:`formkit.classgroups.conductor_factors`:
``f^s·e_p(s)`` is invariant under ``s ↦ 1 − s``.)  For ``ψ = 1`` the poles are at
``s = 1`` (residue ``r = h⁺·log ε⁺``: each narrow class contributes ``log ε⁺/√D`` to the
residue of ``ζ(s, C)``, ``ε⁺ > 1`` the least totally positive unit of ``O``) and ``s = 0``
(residue ``−r``).

**The smoothed sum** (Lavrik's approximate functional equation; Iwaniec–Kowalski,
*Analytic Number Theory*, Thm 5.3, from memory).  The inverse Mellin transform of
``γ_0`` is ``φ(x) = 4·K_0(2πx)`` (from ``∫_0^∞ K_0(x)x^(w−1)dx = 2^(w−2)Γ(w/2)²``; checked
in the tests against ``mpmath.quad``), that of ``γ_1`` is ``x·φ(x)``.  With
``G(w, y) = ∫_y^∞ 4K_0(2πx)·x^(w−1) dx``, ``a_ψ(n) = Σ_{N𝔞 = n} ψ(𝔞)`` and any ``t > 0``,

    Λ(s, ψ) = Σ_n a_ψ(n)·(√D/n)^s·G(s + δ, nt/√D) + Σ_n a_ψ̄(n)·(√D/n)^(1−s)·G(1 − s + δ, n/(t√D))
              + [ψ = 1]·r·(t^(s−1)/(s − 1) − t^s/s).

The value must not depend on ``t``: every result is computed at ``t = 1`` and
``t = 6/5`` and the two balls must overlap (a check of the functional equation, of
``W = 1`` and of the residue), else ``ArithmeticError``.

``G`` is certified by :mod:`formkit.analytic.k0_mellin` (series of ``K_0`` integrated
termwise, explicit cut).  **The n-sums** are cut at ``N`` with the bound ``|a_ψ(n)| ≤ σ₁(n) ≤ n²`` (the number of
subgroups of index ``n`` of ``Z²``), ``K_0(x) ≤ √(π/2x)·e^(−x)`` (``K_ν`` increases with
``ν``; ``K_{1/2}`` is that function) and ``∫_y^∞ x^a e^(−cx)dx ≤ y^a e^(−cy)/(c − a⁺/y)``:
the rest is at most ``2(√D)^σ c^a (N+1)^B e^(−β(N+1))/((1 − q)(2π − a⁺/((N+1)c)))`` with
``c`` the step of ``y``, ``a = σ + δ − 3/2``, ``B = 1/2 + δ``, ``β = 2πc``,
``q = e^(B/(N+1) − β)``.  Both cuts are added to the ball radius.

**Exact zeros.** Where ``γ_δ(s)`` has a (double) pole, ``s + δ ∈ {0, −2, −4, …}``,
``Λ`` has at most a simple one, so ``L(s, ψ) = 0`` exactly (the trivial zeros).

References
----------
.. [1] E. Hecke, "Eine neue Art von Zetafunktionen und ihre Beziehungen zur Verteilung
       der Primzahlen II", Math. Z. 6 (1920) (theta functions of lattices with units).
.. [2] J. Neukirch, *Algebraic Number Theory*, Springer 1999, VII §8 (Hecke characters,
       the functional equation and its gamma factors).
.. [3] A. F. Lavrik, "Approximate functional equations of Dirichlet functions",
       Izv. Akad. Nauk SSSR 32 (1968) (the smoothed sum; from memory).
.. [4] M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*, 9.6.24
       (``K_ν`` as an integral of ``e^(−x cosh t)cosh νt``, hence increasing in ``ν``).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from fractions import Fraction
from itertools import product

from ..analytic.balls import (
    CertifiedValue,
    ComplexArgument,
    _radius,
    as_complex_argument,
    ball_lower,
    bits_for,
    certified,
    check_digits,
)
from ..analytic.k0_mellin import incomplete_mellin_balls, is_pole_of_gamma_half
from ..core.arith import as_int
from ..core.discriminants import fundamental_unit, validate_discriminant
from ..core.modular_roots import sqrt_mod
from ..errors import DiscriminantError, FormkitError

__all__ = [
    "MAX_CONTINUATION_IMAGINARY_PART",
    "character_signature",
    "continued_class_character_l_series",
    "continued_partial_zeta",
]

#: The largest ``|Im s|`` accepted (``|γ(s)|`` falls like ``e^(−π|Im s|/2)``: more terms and bits).
MAX_CONTINUATION_IMAGINARY_PART = 100

#: The second value of the free parameter ``t`` (the first is 1) used as a check.
_CHECK_T = Fraction(6, 5)


def _positive(D: object, what: str) -> int:
    D = validate_discriminant(D)
    if D < 0:
        raise DiscriminantError(
            f"{what} is the real quadratic (D > 0) counterpart of the Epstein zeta function; for D = {D} < 0 "
            "use the Epstein zeta functions of the positive definite forms (formkit epstein D S --classes)"
        )
    return D


def _digits_of(ball, cap: int) -> int:
    """The number of significant digits a ball certifies (at most ``cap``; 0 when none)."""
    r = _radius(ball)
    low = ball_lower(ball)
    if r == 0:
        return cap
    if not low > 0:
        return 0
    return max(0, min(cap, math.floor(math.log10(low / r))))


def _tail_bound(sigma: float, delta: int, c: float, rootD: float, N: int) -> float:
    """Bound for ``Σ_{n>N} σ₁(n)·(√D/n)^σ·|G(σ + δ + i·…, nc)|`` (module docstring)."""
    a = sigma + delta - 1.5
    B = 0.5 + delta
    beta = 2 * math.pi * c
    q = math.exp(B / (N + 1) - beta)
    den = 2 * math.pi - max(a, 0.0) / ((N + 1) * c)
    if q >= 1 or den <= 0:
        return math.inf
    log_b = math.log(2) + sigma * math.log(rootD) + a * math.log(c) + B * math.log(N + 1) - beta * (N + 1)
    return math.exp(log_b) / ((1 - q) * den) * (1 + 1e-9)


def _cut(sigma: float, delta: int, c: float, rootD: float, tol: float) -> tuple[int, float]:
    """The least ``N`` (search by doubling then bisection) whose tail bound is ``≤ tol``."""
    hi = max(8, int(1 / c))
    while _tail_bound(sigma, delta, c, rootD, hi) > tol:
        hi *= 2
    lo = hi // 2
    while hi - lo > 1:
        mid = (lo + hi) // 2
        if _tail_bound(sigma, delta, c, rootD, mid) > tol:
            lo = mid
        else:
            hi = mid
    return hi, _tail_bound(sigma, delta, c, rootD, hi)


def _ideal_counts(D: int, N: int, G):
    """``counts[n] = [(class index, number of invertible ideals of norm n in it)]`` for ``n ≤ N``.

    Returned with the same lists for the primitive ideals only.
    """
    from ..core.enumeration import _factor_with, _spf_sieve

    index = {x: i for i, x in enumerate(G.elements())}
    spf = _spf_sieve(4 * N + 4)
    primitive: list[dict[int, int]] = [{} for _ in range(N + 1)]
    for a in range(1, N + 1):
        factors = _factor_with(spf, 4 * a)
        for b in {r % (2 * a) for r in sqrt_mod(D, 4 * a, factors)}:
            c = (b * b - D) // (4 * a)
            if math.gcd(a, b, c) == 1:  # invertible
                i = index[G((a, b, c))]
                primitive[a][i] = primitive[a].get(i, 0) + 1
    counts: list[dict[int, int]] = [{} for _ in range(N + 1)]
    for a in range(1, N + 1):  # every invertible ideal is m·𝔟, 𝔟 primitive, m ≥ 1, same narrow class
        for i, k in primitive[a].items():
            m = 1
            while a * m * m <= N:
                counts[a * m * m][i] = counts[a * m * m].get(i, 0) + k
                m += 1
    return [sorted(d.items()) for d in counts], [sorted(d.items()) for d in primitive]


def character_signature(D: object, character: Sequence[int]) -> int:
    """``δ(ψ) ∈ {0, 1}``: ``ψ((α)) = sign(N α)^δ`` on principal ideals (module docstring).

    Examples
    --------
    >>> character_signature(12, [1]), character_signature(5, [])     # ε = 2 + √3 has norm +1
    (1, 0)
    """
    from .dispatch import class_group

    D = _positive(D, "the signature of a narrow class character")
    G = class_group(D, method="enumeration")
    phase = _phase(G, [as_int(k, "character exponent") for k in character])
    b0 = D % 2
    x = G((-1, b0, (D - b0 * b0) // 4))  # the forms representing −1: the class of (√D)
    p = phase(x)
    if p not in (0, Fraction(1, 2)):  # pragma: no cover - (√D)² = (D) is narrowly principal
        raise ArithmeticError(f"ψ on the class of (√D) is e^(2πi·{p}), not ±1")
    return 0 if p == 0 else 1


def _phase(G, k: list[int]):
    inv = G.invariants
    if len(k) != len(inv):
        raise FormkitError(
            f"a character of Cl⁺({G.discriminant}) ≅ {G.structure} is given by {len(inv)} exponents (one per "
            f"invariant {list(inv)}), not {len(k)}"
        )

    def phase(x) -> Fraction:
        e = G.discrete_log(x)
        p = sum((Fraction(ki * ei, ni) for ki, ei, ni in zip(k, e, inv)), Fraction(0))
        return p - math.floor(p)

    return phase


def _check_s(s: ComplexArgument) -> None:
    if abs(s.imag) > MAX_CONTINUATION_IMAGINARY_PART:
        raise FormkitError(
            f"|Im s| = {float(abs(s.imag)):.4g} exceeds {MAX_CONTINUATION_IMAGINARY_PART}: the smoothed sum "
            "loses about |Im s|·2.3 bits and needs ever more terms there"
        )


def _lambda_sums(D, s, deltas, counts_for, G, t, prec, tol_of):
    """Per δ: ``(S1, S2, N1, N2, tail)``: the per-class sums of the two halves at parameter ``t``."""
    from flint import acb, arb, ctx, fmpq

    out = {}
    rootD = math.sqrt(D)
    with ctx.workprec(prec):
        sqD = arb(D).sqrt()
        for delta in deltas:
            tol = tol_of(delta)
            sig = float(s.real)
            N1, T1 = _cut(sig, delta, float(t) / rootD, rootD, tol)
            N2, T2 = _cut(1 - sig, delta, 1 / (float(t) * rootD), rootD, tol)
            counts = counts_for(max(N1, N2))
            h = G.order
            halves = []
            for w, N, step, expo in (
                (s + delta, N1, t / rootD, s),
                (1 - s + delta, N2, 1 / (t * rootD), 1 - s),
            ):

                def make_ys(N=N, inverse=(expo is not s)):
                    tq = arb(fmpq(t.numerator, t.denominator))
                    st = 1 / (tq * arb(D).sqrt()) if inverse else tq / arb(D).sqrt()
                    return [n * st for n in range(1, N + 1)]

                gs = incomplete_mellin_balls(w, float(N * step) * (1 + 1e-12), make_ys, prec)
                e = acb(expo.ball())
                sums = [acb(0) for _ in range(h)]
                for n in range(1, N + 1):
                    if not counts[n]:
                        continue
                    v = ((sqD / n).log() * e).exp() * gs[n - 1]
                    for i, k in counts[n]:
                        sums[i] += k * v
                halves.append(sums)
            out[delta] = (halves[0], halves[1], N1, N2, T1 + T2)
    return out


def _continued_l_values(D: int, s: ComplexArgument, digits: int, characters, check: bool = True):
    """``{character: (ball of L(s, ψ), δ, terms)}`` for the given characters (exponent tuples)."""
    from flint import acb, arb, ctx, fmpq

    from .dispatch import class_group

    _check_s(s)
    G = class_group(D, method="enumeration")
    elements = list(G.elements())
    h = len(elements)
    sig = {}
    phases = {}
    for k in characters:
        ph = _phase(G, list(k))
        phases[k] = [ph(x) for x in elements]
        sig[k] = character_signature(D, k)
    trivial = tuple(0 for _ in G.invariants)
    if s.is_integer and s.real == 1 and trivial in characters:
        raise FormkitError(
            f"s = 1 is the pole of L(s, ψ) for the trivial character of Cl⁺({D}) (and of ζ(s, C))"
        )
    zero = {k for k in characters if is_pole_of_gamma_half(s + sig[k])}
    deltas = sorted({sig[k] for k in characters if k not in zero})
    cache: dict[int, list] = {}

    def counts_for(N: int):
        if not cache or max(cache) < N:
            cache.clear()
            cache[N] = _ideal_counts(D, N, G)
        return cache[max(cache)][0]

    # |D^(s/2)·γ_δ(s)|: the scale of the error allowed on Λ (an error 10^(-d) on L)
    guard = 8
    results: dict = {}
    for attempt in range(2):
        target = digits + guard
        with ctx.workprec(64):
            scales = {}
            for delta in deltas:
                g = (acb(s.ball()) + delta) / 2
                val = (acb(arb(D).log()) * acb(s.ball()) / 2).exp() * g.gamma() ** 2
                val *= (-(acb(s.ball()) + delta) * arb.pi().log()).exp()
                scales[delta] = max(float(val.abs_lower()), 1e-300)
        lost = max([0.0] + [-math.log2(v) for v in scales.values()])
        prec = bits_for(target) + int(lost) + 60

        def tol_of(delta: int, target: int = target, scales: dict = scales) -> float:
            return 10.0 ** (-target) * scales[delta]

        ts = [Fraction(1), _CHECK_T] if check else [Fraction(1)]
        per_t = []
        for t in ts:
            sums = _lambda_sums(D, s, deltas, counts_for, G, t, prec, tol_of)
            per_t.append((t, sums))
        with ctx.workprec(prec):
            sb = acb(s.ball())
            reg = None
            values = {}
            for k in characters:
                if k in zero:
                    values[k] = (acb(0), sig[k], 0)
                    continue
                delta = sig[k]
                psi = [acb.exp_pi_i(acb(2 * fmpq(p.numerator, p.denominator))) for p in phases[k]]
                balls = []
                terms = 0
                for t, sums in per_t:
                    S1, S2, N1, N2, tail = sums[delta]
                    lam = sum((psi[i] * S1[i] for i in range(h)), acb(0))
                    lam += sum((psi[i].conjugate() * S2[i] for i in range(h)), acb(0))
                    if k == trivial:
                        if reg is None:
                            e = fundamental_unit(D)
                            reg = ((e.t + e.u * arb(D).sqrt()) / 2).log() * (2 if e.norm == -1 else 1)
                        tt = acb(arb(fmpq(t.numerator, t.denominator)))
                        lam += h * reg * ((sb - 1) * tt.log()).exp() / (sb - 1)
                        lam -= h * reg * (sb * tt.log()).exp() / sb
                    lam += acb(arb(0, tail), arb(0, tail))
                    gam = ((sb + delta) / 2).gamma() ** 2 * (-(sb + delta) * arb.pi().log()).exp()
                    gam *= (acb(arb(D).log()) * sb / 2).exp()
                    balls.append(lam / gam)
                    terms = max(terms, N1 + N2)
                if len(balls) == 2 and not balls[0].overlaps(balls[1]):
                    raise ArithmeticError(
                        f"L({s}, ψ) for ψ = {list(k)} on Cl⁺({D}): the smoothed sums at t = 1 and t = {_CHECK_T} "
                        "disagree (the functional equation failed a check)"
                    )
                best = balls[0]
                if len(balls) == 2 and _radius_of(balls[1]) < _radius_of(best):
                    best = balls[1]
                values[k] = (best, delta, terms)
        results = values
        worst = min(
            (_digits_of(_real_if(v[0], s), digits) for k, v in values.items() if k not in zero),
            default=digits,
        )
        if worst >= digits or attempt == 1:
            break
        guard += digits - worst + 5
    N = max(cache) if cache else 0
    prim = [0] * h
    for n in range(1, N + 1):
        for i, c in cache[N][1][n]:
            prim[i] += c
    return G, elements, results, zero, (N, prim)


def _radius_of(x) -> float:
    return float(x.real.rad()) + float(x.imag.rad())


def _real_if(ball, s: ComplexArgument):
    return ball.real if s.is_real and ball.imag.contains(0) else ball


def _method(terms: int) -> str:
    return (
        f"analytic continuation: Λ(s, ψ) = Λ(1 − s, ψ̄) (Hecke) and the smoothed sum with K_0 "
        f"(Lavrik), {terms} terms, checked at t = 1 and t = {_CHECK_T}; explicit tail bounds, ball arithmetic"
    )


def continued_class_character_l_series(
    D: object, character: Sequence[int], s: object, *, digits: int = 30, check: bool = True
) -> CertifiedValue:
    """``L(s, ψ) = Σ_{𝔞} ψ(𝔞)·N(𝔞)^(−s)`` at any complex ``s``, for a character of ``Cl⁺(D)``, ``D > 0``.

    The analytic continuation by the functional equation (module docstring); ``D`` any
    positive non-square discriminant (the sum runs over the invertible ideals of the order).

    Parameters
    ----------
    D : int
        A positive non-square discriminant.
    character : sequence of int
        ``ψ(g_i) = e^(2πi·k_i/n_i)`` on the generators of ``class_group(D)``.
    s : number or text
        Any complex ``s`` with ``|Im s| ≤ 100`` (``s ≠ 1`` for the trivial character).
    digits : int
        Significant digits requested (fewer are reported only if the ball does not give them).
    check : bool
        Compute at two values of the free parameter ``t`` and require agreement (default).

    Returns
    -------
    CertifiedValue
        Exact 0 at the trivial zeros.

    Raises
    ------
    DiscriminantError
        If ``D`` is not positive.
    FormkitError
        For a wrong character, at the pole, or when ``|Im s|`` is too large.

    Examples
    --------
    >>> continued_class_character_l_series(12, [1], -1).text()     # odd ψ: a trivial zero
    '0'
    >>> continued_class_character_l_series(229, [1], "1/2", digits=12).text()
    '0.293826834654'

    References
    ----------
    Neukirch, *Algebraic Number Theory*, VII §8; Hecke (1920).
    """
    D = _positive(D, "the L-series of a narrow class group character")
    s = as_complex_argument(s)
    digits = check_digits(digits)
    k = tuple(as_int(x, "character exponent") for x in character)
    G, _el, values, zero, _prim = _continued_l_values(D, s, digits, [k], check)
    label = "(" + ", ".join(str(v) for v in k) + ")"
    quantity = f"L(s, ψ), ψ = {label} on Cl⁺({D}) ≅ {G.structure}"
    ball, delta, terms = values[k]
    if k in zero:
        return CertifiedValue(
            quantity,
            s,
            0,
            0.0,
            digits,
            f"trivial zero: γ_{delta}(s) has a double pole, Λ at most a simple one",
            0,
            Fraction(0),
        )
    ball = _real_if(ball, s)
    got = _digits_of(ball, digits)
    if got < 1:
        raise FormkitError(f"L({s}, ψ) for D = {D}: no certified digit (the value is too close to 0)")
    return certified(ball, got, quantity=quantity, s=s, method=_method(terms), terms=terms, signature=delta)


def continued_partial_zeta(D: object, s: object, *, digits: int = 30, check: bool = True):
    """``ζ(s, C)`` for every narrow class of ``D > 0`` at complex ``s ≠ 1``: the engine of ``partial_zeta_values``.

    ``ζ(s, C) = (1/h⁺)·Σ_ψ ψ̄(C)·L(s, ψ)`` (orthogonality of the characters), each
    ``L(s, ψ)`` as in :func:`continued_class_character_l_series`.

    Returns
    -------
    tuple
        ``(forms, values, N, primitive_counts, provenance)``: the reduced forms of the
        classes (in ``class_group(D)`` order), the certified ``ζ(s, C)``, the largest norm
        summed, the primitive invertible ideals of norm ``≤ N`` per class, and the classes'
        provenance.  :func:`formkit.classgroups.narrow_class_zeta.partial_zeta_values` wraps this.

    Raises
    ------
    DiscriminantError
        If ``D`` is not positive.
    FormkitError
        At ``s = 1`` or when ``|Im s|`` is too large.

    Examples
    --------
    >>> forms, values, N, counts, _p = continued_partial_zeta(12, -1)       # Cl⁺(12) ≅ C2
    >>> [v.text() for v in values]
    ['0.0833333333333333333333333333333', '0.0833333333333333333333333333333']

    References
    ----------
    Hecke (1917, 1920); Zagier, *Zetafunktionen und quadratische Körper*, §13.
    """
    from flint import acb, ctx, fmpq

    from .dispatch import class_group

    D = _positive(D, "the partial zeta function ζ(s, C)")
    s = as_complex_argument(s)
    digits = check_digits(digits)
    if s.is_integer and s.real == 1:
        raise FormkitError("s = 1 is the pole of every ζ(s, C) (residue log ε⁺/√D); any other s is fine")
    G0 = class_group(D, method="enumeration")
    chars = list(product(*[range(n) for n in G0.invariants]))
    G, elements, values, zero, primitive = _continued_l_values(D, s, digits + 2, chars, check)
    h = len(elements)
    terms = max(v[2] for v in values.values())
    out = []
    with ctx.workprec(bits_for(digits) + 80):
        for x in elements:
            total = acb(0)
            for k in chars:
                if k in zero:
                    continue
                ph = _phase(G, list(k))(x)
                total += acb.exp_pi_i(acb(-2 * fmpq(ph.numerator, ph.denominator))) * values[k][0]
            total /= h
            f = x.form
            quantity = f"ζ(s, C), C = class of ({f.a}, {f.b}, {f.c}) (D = {D})"
            if len(zero) == len(chars):
                out.append(
                    CertifiedValue(
                        quantity, s, 0, 0.0, digits, "every L(s, ψ) has a trivial zero here", 0, Fraction(0)
                    )
                )
                continue
            ball = _real_if(total, s)
            got = _digits_of(ball, digits)
            if got < 1:
                raise FormkitError(f"ζ({s}, C) for D = {D}, C = [{f.a}, {f.b}, {f.c}]: no certified digit")
            out.append(
                certified(
                    ball,
                    got,
                    quantity=quantity,
                    s=s,
                    method=f"(1/h⁺)·Σ_ψ ψ̄(C)·L(s, ψ); {_method(terms)}",
                    terms=terms,
                )
            )
    N, counts = primitive
    return (
        tuple(x.form for x in elements),
        tuple(out),
        N,
        tuple(counts),
        str(G.provenance),
    )
