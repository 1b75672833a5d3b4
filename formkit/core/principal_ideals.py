"""Principality of ideals, with a generator; compact representations of huge generators (D > 0).

Reduction steps on ideals carry their multipliers.  For a primitive ideal
``𝔞 = [|a|, (−b + √D)/2]`` with form ``(a, b, c)``, the step ``ρ`` gives

    𝔞' = μ·𝔞,  μ = (−b − √D)/(2a),  𝔞' = [|c|, (−b' + √D)/2],  b' ≡ −b (mod 2c)

(Buchmann–Vollmer, *Binary Quadratic Forms*, §6.4 and Ch. 9 on the infrastructure;
Cohen GTM 138, §5.8, from memory).  Reducing ``I = k·I₀`` to a reduced ideal ``B = ν·I₀``
and finding ``B`` among the reduced principal ideals decides principality and gives a
generator:

* ``D < 0``: the only reduced principal ideal is ``O`` (reduced forms are unique in
  their class), so ``I`` is principal iff ``B = O``, with generator ``γ = k/ν``;
* ``D > 0``: the reduced principal ideals form the cycle of ``O``; it is walked with
  ``A_{i+1} = μ_i A_i = (θ_{i+1})``, ``θ_{i+1} = μ_i θ_i``, until ``B`` appears (principal,
  ``γ = k·θ/ν``) or the cycle closes (not principal).  The walk is bounded
  (``max_steps``); beyond it the test refuses to answer.

A generator of an ideal of small norm in a real order can be as large as the
fundamental unit (``log γ`` up to about the regulator), so when ``log |γ|`` exceeds
``EXPLICIT_LIMIT`` the generator is returned as a :class:`CompactProduct`

    γ = ∏_j α_j^{e_j},   e_j = 2^{k−j} (and a last factor with exponent 1),

where every ``α_j`` is a small exact number of the field: the product of the few
reduction multipliers met when the reduced ideal ``(θ_{j−1})²`` is reduced and moved to
distance ``≈ log|γ|/2^{k−j}`` (the "double and adjust" method of compact
representations; Buchmann, Thiel, Williams, *Short representation of quadratic
integers*, 1995, and Jacobson–Williams, *Solving the Pell Equation*, Ch. 5, from memory).
Its size is ``O(log log γ)`` numbers of ``O(√D)``-size coordinates.  Every step is
verified by exact ideal arithmetic (``(x + y√D)·A_{j−1}² = 2z·A_j`` for
``α_j = (x + y√D)/(2z)``), so the product generates ``I`` exactly.

References
----------
.. [1] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, §6.4, Ch. 9.
.. [2] J. Buchmann, C. Thiel, H. C. Williams, "Short representation of quadratic
       integers", in *Computational Algebra and Number Theory*, Kluwer 1995 (from memory).
.. [3] M. J. Jacobson, H. C. Williams, *Solving the Pell Equation*, Springer 2009, Ch. 5.
"""

from __future__ import annotations

import html
import math

from ..errors import FormkitError
from .arith import isqrt
from .discriminants import fundamental_unit, validate_discriminant
from .displays import latex_text as _latex_text
from .ideals import QuadraticIdeal, principal_ideal
from .quadratic_numbers import QuadraticNumber

__all__ = ["CompactProduct", "PrincipalityResult", "principal_generator", "EXPLICIT_LIMIT", "MAX_CYCLE_WALK"]

#: Generators with ``log|γ|`` above this (about 434 decimal digits) are given in compact form.
EXPLICIT_LIMIT = 1000.0
#: Default bound on the steps along the principal cycle (``D > 0``).
MAX_CYCLE_WALK = 2_000_000


class CompactProduct:
    """An exact number ``∏ α_j^{e_j}`` of a real quadratic field, kept unexpanded.

    ``terms`` is a tuple of ``(α_j, e_j)`` with :class:`QuadraticNumber` ``α_j`` and
    integer exponents.  Format of :meth:`to_dict` (documented for the JSON output):
    ``{"terms": [{"number": [x, y, z], "text": "(x + y√D)/(2z) in √m terms",
    "exponent": e}, …], "log_abs": float, "norm_sign": ±1, "digits": int}``, meaning
    ``∏ ((x + y√D)/(2z))^e`` in the order's coordinates.
    """

    __slots__ = ("discriminant", "terms")

    def __init__(self, D: int, terms) -> None:
        self.discriminant = D
        self.terms: tuple[tuple[QuadraticNumber, int], ...] = tuple((a, int(e)) for a, e in terms if e)

    def log_abs(self, digits: int = 30):
        """``log|γ|`` (real embedding with ``√D > 0``) as an mpmath number with ``digits`` digits."""
        import mpmath

        with mpmath.workdps(digits + 10):
            sqD = mpmath.sqrt(self.discriminant)
            total = mpmath.mpf(0)
            for a, e in self.terms:
                x, y, z = a.coordinates
                value = (x + y * sqD) / (2 * z)
                total += e * mpmath.log(abs(value))
        return total

    @property
    def norm_sign(self) -> int:
        """The sign of ``N(γ)``."""
        s = 1
        for a, e in self.terms:
            if a.norm < 0 and e % 2:
                s = -s
        return s

    def expand(self, max_digits: int = 100_000) -> QuadraticNumber:
        """The number itself (refused when its coordinates would exceed ``max_digits`` digits)."""
        size = float(abs(self.log_abs(15))) / math.log(10)
        size += sum(
            abs(e) * (len(str(a.coordinates[2])) + len(str(abs(a.coordinates[0])))) for a, e in self.terms
        )
        if size > max_digits:
            raise FormkitError(
                f"the compact product has about {size:.3g} digits, more than max_digits = {max_digits}"
            )
        out = QuadraticNumber(self.discriminant, 2, 0)
        for a, e in self.terms:
            out = out * a**e
        return out

    def text(self) -> str:
        """``'((3 + √94)/5)^1024 · (…)^512 · …'``."""
        parts = []
        for a, e in self.terms:
            t = a.text()
            t = f"({t})" if (" " in t or "/" in t) else t
            parts.append(t if e == 1 else f"{t}^{e}")
        return " · ".join(parts) or "1"

    def to_dict(self) -> dict:
        """JSON-ready (the format above)."""
        return {
            "terms": [
                {"number": list(a.coordinates), "text": a.text(), "exponent": e} for a, e in self.terms
            ],
            "log_abs": float(self.log_abs(20)),
            "norm_sign": self.norm_sign,
            "digits": int(float(self.log_abs(15)) / math.log(10)) + 1,
        }

    def __repr__(self) -> str:
        return f"CompactProduct(D={self.discriminant}, {len(self.terms)} terms, log|γ| ≈ {float(self.log_abs(15)):.6g})"

    def _repr_html_(self) -> str:
        return (
            f"compact product of {len(self.terms)} terms, log|γ| ≈ {float(self.log_abs(15)):.10g}, "
            f"N(γ) sign {self.norm_sign:+d}<br><small>{html.escape(self.text()[:400])}</small>"
        )

    def _repr_latex_(self) -> str:
        return _latex_text(
            f"compact product of {len(self.terms)} terms, log|γ| ≈ {float(self.log_abs(15)):.10g}"
        )


class PrincipalityResult:
    """Whether an ideal is principal, with a generator; how it was decided.

    ``principal``: ``I = γO`` for some ``γ``; ``narrowly_principal``: also with
    ``N(γ) > 0`` (for ``D < 0`` the same); ``generator``: a :class:`QuadraticNumber`
    (``None`` when not principal or given in compact form; for ``D > 0`` chosen positive in
    the real embedding with ``√D > 0``, a generator being unique up to units); ``compact``: a
    :class:`CompactProduct` when the generator is huge; ``generator_norm``: ``N(γ)``
    (``±N(I)``); ``method``: how it was decided (always unconditional: exact reduction and
    a complete walk of the cycle).
    """

    __slots__ = (
        "compact",
        "generator",
        "generator_norm",
        "ideal",
        "method",
        "narrowly_principal",
        "principal",
    )

    def __init__(self, ideal, principal, narrow, generator, compact, norm, method) -> None:
        self.ideal: QuadraticIdeal = ideal
        self.principal: bool = principal
        self.narrowly_principal: bool = narrow
        self.generator: QuadraticNumber | None = generator
        self.compact: CompactProduct | None = compact
        self.generator_norm: int | None = norm
        self.method: str = method

    def statement(self) -> str:
        """One sentence."""
        name = self.ideal.text()
        if not self.principal:
            return f"{name} is not principal ({self.method})"
        if self.generator is not None:
            gen = self.generator.text()
        else:
            gen = f"the compact product {self.compact.text() if self.compact is not None else '?'}"
        s = f"{name} is principal: {name} = ({gen}), N(generator) = {self.generator_norm}"
        if self.ideal.discriminant > 0:
            s += (
                "; narrowly principal"
                if self.narrowly_principal
                else "; not narrowly principal (every generator has negative norm)"
            )
        return s + f" ({self.method})"

    def to_dict(self) -> dict:
        """JSON-ready: ``principal``, ``narrowly_principal``, ``generator`` (``[x, y, z]`` or null),
        ``generator_text``, ``compact_generator`` (null or the :class:`CompactProduct` format),
        ``generator_norm``, ``method``, ``ideal``."""
        return {
            "ideal": self.ideal.to_dict(),
            "principal": self.principal,
            "narrowly_principal": self.narrowly_principal,
            "generator": list(self.generator.coordinates) if self.generator is not None else None,
            "generator_text": self.generator.text() if self.generator is not None else None,
            "compact_generator": self.compact.to_dict() if self.compact is not None else None,
            "generator_norm": self.generator_norm,
            "method": self.method,
        }

    def __repr__(self) -> str:
        return f"PrincipalityResult({self.statement()})"

    def _repr_html_(self) -> str:
        return html.escape(self.statement())

    def _repr_latex_(self) -> str:
        return _latex_text(self.statement())


# -- steps on reduced ideals, with their multipliers ----------------------------------------------
def _mu(D: int, a: int, b: int) -> QuadraticNumber:
    return QuadraticNumber(D, -b, -1, a)  # (−b − √D)/(2a)


def _log_mu(D: int, a: int, b: int) -> float:
    # log|(−b − √D)/(2a)| = log|b + √D| − log(2|a|), in floating point (navigation only)
    v = b + math.sqrt(D) if D > 0 else None
    if v is None:  # pragma: no cover - D > 0 only
        return 0.0
    return math.log(abs(v)) - math.log(2 * abs(a))


def _rho(D: int, s: int, a: int, b: int, c: int) -> tuple[int, int, int]:
    """The next form in the reduction/cycle of an indefinite form (Buchmann–Vollmer's normalisation)."""
    ac = abs(c)
    if ac <= s:
        bp = s - ((s + b) % (2 * ac))
    else:
        bp = (-b) % (2 * ac)
        if bp > ac:
            bp -= 2 * ac
    return c, bp, (bp * bp - D) // (4 * c)


def _rho_back(D: int, s: int, a: int, b: int, c: int) -> tuple[int, int, int]:
    """The reduced form before ``(a, b, c)`` in its cycle (inverse of :func:`_rho` on reduced forms)."""
    aa = abs(a)
    bp = s - ((s + b) % (2 * aa))
    return (bp * bp - D) // (4 * a), bp, a


def _is_reduced_indefinite(s: int, a: int, b: int) -> bool:
    aa = abs(a)
    return 0 < b <= s and s - b < 2 * aa <= s + b


def _reduce(D: int, a: int, b: int, c: int) -> tuple[tuple[int, int, int], QuadraticNumber]:
    """A reduced form of the ideal class and ``ν`` with ``[reduced] = ν·[a, (−b+√D)/2]``."""
    nu = QuadraticNumber(D, 2, 0)
    if D < 0:
        while True:
            b = (b + a - 1) % (2 * a) - a + 1  # translation: the same ideal
            c = (b * b - D) // (4 * a)
            if a < c or (a == c and b >= 0):
                return (a, b, c), nu
            nu = _mu(D, a, b) * nu
            a, b, c = c, -b, a
    s = int(isqrt(D))
    for _ in range(10_000 + 4 * max(a.bit_length(), c.bit_length())):
        if _is_reduced_indefinite(s, a, b):
            return (a, b, c), nu
        nu = _mu(D, a, b) * nu
        a, b, c = _rho(D, s, a, b, c)
    raise ArithmeticError(f"reduction of ({a}, {b}, {c}) did not end")  # pragma: no cover


def _same_ideal(f: tuple[int, int, int], g: tuple[int, int, int]) -> bool:
    a1, b1 = abs(f[0]), f[1]
    a2, b2 = abs(g[0]), g[1]
    return a1 == a2 and (b1 - b2) % (2 * a1) == 0


def principal_generator(
    ideal: QuadraticIdeal, *, compact: bool | None = None, max_steps: int = MAX_CYCLE_WALK
) -> PrincipalityResult:
    """Decide whether an invertible ideal is principal, and give a generator.

    Parameters
    ----------
    ideal : QuadraticIdeal
    compact : bool, optional
        ``D > 0``: force (``True``) or forbid (``False``) the compact form of the
        generator; by default it is used when ``log|γ| > EXPLICIT_LIMIT``.
    max_steps : int
        ``D > 0``: give up (``FormkitError``) after this many steps along the principal cycle.

    Returns
    -------
    PrincipalityResult

    Examples
    --------
    >>> from formkit.core.ideals import ideal_from_generators, prime_ideals_above
    >>> principal_generator(ideal_from_generators(-20, ["3", "1 + √-5"])).principal
    False
    >>> r = principal_generator(ideal_from_generators(-20, ["1 + √-5", "6"]) * ideal_from_generators(-20, ["1 - √-5", "6"]))
    >>> r.principal, r.generator
    (True, QuadraticNumber(D=-20, 6))
    >>> P = prime_ideals_above(376, 2).ideals[0]          # Q(√94): h = 1, h⁺ = 2
    >>> r = principal_generator(P); r.principal, r.narrowly_principal, r.generator_norm
    (True, True, 2)
    """
    if not isinstance(ideal, QuadraticIdeal):
        raise FormkitError(f"principal_generator needs a QuadraticIdeal, not {ideal!r}")
    D = validate_discriminant(ideal.discriminant)
    k, a, b = ideal.coefficients
    c = (b * b - D) // (4 * a)
    red, nu = _reduce(D, a, b, c)
    if D < 0:
        if red[0] != 1:
            return PrincipalityResult(
                ideal, False, False, None, None, None, "reduction of the form: reduced form ≠ principal form"
            )
        gamma = QuadraticNumber(D, 2 * k, 0) / nu
        _check(ideal, gamma)
        return PrincipalityResult(
            ideal, True, True, gamma, None, int(gamma.norm), "reduction of the form to the principal form"
        )
    s = int(isqrt(D))
    # the principal cycle: start from a reduced form of O
    start, theta0 = _reduce(D, 1, D % 2, (D % 2 - D) // 4)
    cur, delta, steps = start, 0.0, 0
    found = _same_ideal(cur, red)
    while not found:
        delta += _log_mu(D, cur[0], cur[1])
        cur = _rho(D, s, *cur)
        steps += 1
        if _same_ideal(cur, start):
            return PrincipalityResult(
                ideal,
                False,
                False,
                None,
                None,
                None,
                f"complete walk of the principal cycle ({steps} reduced ideals)",
            )
        if steps >= max_steps:
            raise FormkitError(
                f"principality of {ideal.text()} undetermined: the principal cycle of D = {D} is longer than "
                f"max_steps = {max_steps} reduced ideals"
            )
        found = _same_ideal(cur, red)
    method = f"walk of the principal cycle: the reduced ideal is {steps} steps from O"
    unit_norm = fundamental_unit(D).norm if D < 10**60 else None
    use_compact = compact if compact is not None else delta > EXPLICIT_LIMIT
    if not use_compact:
        theta = theta0
        f = start
        for _ in range(steps):
            theta = _mu(D, f[0], f[1]) * theta
            f = _rho(D, s, *f)
        gamma = QuadraticNumber(D, 2 * k, 0) * theta / nu
        if _sign(gamma) < 0:
            gamma = -gamma
        _check(ideal, gamma)
        norm = int(gamma.norm)
        narrow = norm > 0 or unit_norm == -1
        return PrincipalityResult(ideal, True, narrow, gamma, None, norm, method)
    cp = _compact(D, s, start, theta0, red, delta)
    last = QuadraticNumber(D, 2 * k, 0) / nu
    sign = _sign(last)
    for x, e in cp.terms:
        if e % 2:
            sign *= _sign(x)
    cp = CompactProduct(D, cp.terms + ((last if sign > 0 else -last, 1),))
    sign = cp.norm_sign
    norm = sign * ideal.norm
    narrow = sign > 0 or unit_norm == -1
    return PrincipalityResult(ideal, True, narrow, None, cp, norm, method + "; generator in compact form")


def _sign(q: QuadraticNumber) -> int:
    """The sign of ``(x + y√D)/(2z)`` in the real embedding with ``√D > 0`` (exact)."""
    x, y, _z = q.coordinates
    D = q.discriminant
    if y == 0 or x == 0 or (x > 0) == (y > 0):
        return 1 if (x > 0 or (x == 0 and y > 0)) else -1
    # x and y√D of opposite signs: the larger absolute value wins
    return (1 if x > 0 else -1) if x * x > D * y * y else (1 if y > 0 else -1)


def _check(ideal: QuadraticIdeal, gamma: QuadraticNumber) -> None:
    if not gamma.in_order() or principal_ideal(ideal.discriminant, gamma) != ideal:  # pragma: no cover
        raise ArithmeticError(f"generator {gamma.text()} does not generate {ideal.text()}")


def _compact(D, s, start, theta0, target, ell) -> CompactProduct:
    """``θ`` with ``(θ) = target`` at distance ``ell`` from ``start`` on the principal cycle, as a compact product.

    Double and adjust: distances ``t_j = ell/2^{k−j}``; ``A_j = (θ_j)`` reduced with
    ``δ(θ_j) ≤ t_j`` close to it; ``θ_j = θ_{j−1}²·α_j``.  Verified exactly at every step.
    """
    k = 0
    while ell / 2**k > 32.0:
        k += 1
    # A_0: walk from start to the last ideal at distance <= t_0
    t0 = ell / 2**k
    cur, delta, alpha = start, 0.0, theta0
    cur, delta, alpha = _walk_to(D, s, cur, delta, alpha, t0)
    terms = [(alpha, 2**k)]
    prev = cur
    _verify_step(D, None, (start, theta0), cur, alpha)
    for j in range(1, k + 1):
        tj = ell / 2 ** (k - j)
        Pa = QuadraticIdeal(D, abs(prev[0]), prev[1])
        sq = Pa * Pa
        kk, a2, b2 = sq.coefficients
        c2 = (b2 * b2 - D) // (4 * a2)
        red, nu = _reduce(D, a2, b2, c2)
        # distance of red: 2·δ + log|ν/kk|
        x, y, z = nu.coordinates
        d = 2 * delta + math.log(abs((x + y * math.sqrt(D)) / (2 * z))) - math.log(kk)
        alpha = nu / kk
        cur, delta, alpha = _walk_to(D, s, red, d, alpha, tj)
        _verify_step(D, prev, None, cur, alpha)
        terms.append((alpha, 2 ** (k - j)))
        prev = cur
    # the last ideal must be the target: a few steps either way
    extra = QuadraticNumber(D, 2, 0)
    f = prev
    for _ in range(4 * (D.bit_length() + 8)):
        if _same_ideal(f, target):
            break
        extra = _mu(D, f[0], f[1]) * extra
        f = _rho(D, s, *f)
    else:  # pragma: no cover - the distances were wrong
        raise ArithmeticError("compact representation: the target ideal was not reached")
    if extra != 1:
        terms.append((extra, 1))
    return CompactProduct(D, terms)


def _walk_to(D, s, f, delta, alpha, t):
    """Move along the cycle (both ways) to the reduced ideal with the largest distance ≤ ``t``."""
    while True:
        step = _log_mu(D, f[0], f[1])
        if delta + step <= t + 1e-9:
            alpha = _mu(D, f[0], f[1]) * alpha
            f = _rho(D, s, *f)
            delta += step
            continue
        break
    while delta > t + 1e-9:
        g = _rho_back(D, s, *f)
        step = _log_mu(D, g[0], g[1])
        alpha = alpha / _mu(D, g[0], g[1])
        f, delta = g, delta - step
    return f, delta, alpha


def _verify_step(D, prev, first, cur, alpha) -> None:
    """Exact check: ``(x + y√D)·A_prev² = 2z·A_cur`` (or ``(x + y√D)·O = 2z·A_0``) for ``α = (x + y√D)/(2z)``."""
    x, y, z = alpha.coordinates
    num = principal_ideal(D, QuadraticNumber(D, 2 * x, 2 * y))  # x + y√D
    lhs = num if prev is None else num * QuadraticIdeal(D, abs(prev[0]), prev[1]) ** 2
    rhs = QuadraticIdeal(D, abs(cur[0]), cur[1]).scaled(2 * z)
    if lhs != rhs:  # pragma: no cover - would be a bug
        raise ArithmeticError("compact representation failed its exact verification")
