"""Binary quadratic forms as frozen values, and the 2×2 integer matrices acting on them.

A form ``(a, b, c)`` is ``Q(x, y) = ax² + bxy + cy²`` with discriminant ``D = b² − 4ac``.
A matrix ``M = [[p, q], [r, s]]`` acts on the right by ``(Q·M)(x, y) = Q(px + qy, rx + sy)``,
so ``(Q·M)·N = Q·(MN)``.  Proper equivalence is the action of SL2(Z), improper
equivalence that of a matrix of determinant −1.

Matrices are plain nested tuples ``((p, q), (r, s))`` of Python ints (type
:data:`Matrix`); helpers here multiply, invert and check them.

References
----------
.. [1] D. A. Cox, *Primes of the Form x² + ny²*, 2nd ed., Wiley 2013, §2.
.. [2] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §5.2.
.. [3] J. Buchmann, U. Vollmer, *Binary Quadratic Forms*, Springer 2007, Ch. 2.
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from typing import TYPE_CHECKING, Any

from ..errors import DiscriminantError, FormError, MatrixError, NotPrimeError, NotPrimitiveError
from .arith import as_int, gcd, is_probable_prime, is_square, isqrt, kronecker
from .modular_roots import sqrt_mod_prime

if TYPE_CHECKING:  # pragma: no cover
    import sympy

__all__ = [
    "Matrix",
    "IDENTITY",
    "Form",
    "FormLike",
    "as_form",
    "as_matrix",
    "mat_mul",
    "mat_det",
    "mat_inverse",
]

Matrix = tuple[tuple[int, int], tuple[int, int]]
IDENTITY: Matrix = ((1, 0), (0, 1))


def as_matrix(value: object, *, name: str = "matrix") -> Matrix:
    """Coerce ``[[p, q], [r, s]]`` (any nested sequences of integers) into a :data:`Matrix`.

    Raises
    ------
    MatrixError
        If the shape is wrong or the determinant is not ±1.

    Examples
    --------
    >>> as_matrix([[2, 1], [1, 1]])
    ((2, 1), (1, 1))
    """
    rows: Any = value
    try:
        (p, q), (r, s) = rows
    except (TypeError, ValueError) as exc:
        raise MatrixError(f"{name} must be [[p, q], [r, s]], not {value!r}") from exc
    m = (
        (as_int(p, name + " entry"), as_int(q, name + " entry")),
        (as_int(r, name + " entry"), as_int(s, name + " entry")),
    )
    if mat_det(m) not in (1, -1):
        raise MatrixError(f"{name} must have determinant ±1 (lie in GL2(Z)), not {mat_det(m)}: {m}")
    return m


def _entries(m: object, name: str = "matrix") -> tuple[int, int, int, int]:
    """``(p, q, r, s)`` of ``[[p, q], [r, s]]``; MatrixError / NotAnIntegerError otherwise."""
    rows: Any = m
    try:
        (p, q), (r, s) = rows
    except (TypeError, ValueError) as exc:
        raise MatrixError(f"{name} must be [[p, q], [r, s]], not {m!r}") from exc
    if type(p) is int and type(q) is int and type(r) is int and type(s) is int:
        return p, q, r, s
    e = name + " entry"
    return as_int(p, e), as_int(q, e), as_int(r, e), as_int(s, e)


def mat_mul(m: Matrix, n: Matrix) -> Matrix:
    """Product ``m·n`` of two 2×2 integer matrices.

    Raises
    ------
    MatrixError
        If an argument is not of the shape ``[[p, q], [r, s]]``.
    NotAnIntegerError
        If an entry is not an integer.

    Examples
    --------
    >>> mat_mul(((1, 1), (0, 1)), ((1, 0), (1, 1)))
    ((2, 1), (1, 1))
    """
    p, q, r, s = _entries(m)
    e, f, g, h = _entries(n)
    return ((p * e + q * g, p * f + q * h), (r * e + s * g, r * f + s * h))


def mat_det(m: Matrix) -> int:
    """Determinant of a 2×2 integer matrix.

    Examples
    --------
    >>> mat_det(((2, 1), (1, 1)))
    1
    """
    p, q, r, s = _entries(m)
    return p * s - q * r


def mat_inverse(m: Matrix) -> Matrix:
    """Inverse of a matrix of determinant ±1 (exact, integral).

    Examples
    --------
    >>> mat_inverse(((2, 1), (1, 1)))
    ((1, -1), (-1, 2))
    """
    p, q, r, s = _entries(m)
    d = p * s - q * r
    if d not in (1, -1):
        raise MatrixError(f"matrix {m} has determinant {d}, so no integral inverse")
    return ((s * d, -q * d), (-r * d, p * d))


class Form:
    """The binary quadratic form ``ax² + bxy + cy²`` as an immutable, hashable value.

    Parameters
    ----------
    a, b, c : int
        The coefficients.  Any integers are allowed (forms with square discriminant
        too); operations that need more (a non-square discriminant, definiteness,
        primitivity) check it and raise :class:`~formkit.errors.FormkitError`.

    Examples
    --------
    >>> f = Form(2, 1, 3)
    >>> f
    Form(2, 1, 3)
    >>> print(f)
    2x^2 + xy + 3y^2
    >>> f.discriminant, f.is_positive_definite, f(1, -1)
    (-23, True, 4)
    >>> f.transform([[1, 1], [0, 1]])
    Form(2, 5, 6)
    """

    __slots__ = ("_a", "_b", "_c")

    _a: int
    _b: int
    _c: int

    def __init__(self, a: object, b: object, c: object) -> None:
        object.__setattr__(self, "_a", int(as_int(a, "a")))
        object.__setattr__(self, "_b", int(as_int(b, "b")))
        object.__setattr__(self, "_c", int(as_int(c, "c")))

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError("Form is immutable")

    def __delattr__(self, name: str) -> None:
        raise AttributeError("Form is immutable")

    def __reduce__(self):
        return (Form, (self._a, self._b, self._c))

    # -- coefficients ---------------------------------------------------------
    @property
    def a(self) -> int:
        """Coefficient of x²."""
        return self._a

    @property
    def b(self) -> int:
        """Coefficient of xy."""
        return self._b

    @property
    def c(self) -> int:
        """Coefficient of y²."""
        return self._c

    @property
    def coefficients(self) -> tuple[int, int, int]:
        """``(a, b, c)`` as a tuple."""
        return (self._a, self._b, self._c)

    def __iter__(self) -> Iterator[int]:
        return iter((self._a, self._b, self._c))

    def __eq__(self, other: object) -> bool:
        if isinstance(other, Form):
            return (self._a, self._b, self._c) == (other._a, other._b, other._c)
        return NotImplemented

    def __hash__(self) -> int:
        return hash(("Form", self._a, self._b, self._c))

    def __lt__(self, other: Form) -> bool:
        if not isinstance(other, Form):
            return NotImplemented
        return self.coefficients < other.coefficients

    # -- invariants -----------------------------------------------------------
    @property
    def discriminant(self) -> int:
        """``b² − 4ac``."""
        return self._b * self._b - 4 * self._a * self._c

    @property
    def content(self) -> int:
        """``gcd(a, b, c)`` (non-negative)."""
        return int(gcd(self._a, self._b, self._c))

    @property
    def is_primitive(self) -> bool:
        """True when ``gcd(a, b, c) = 1``."""
        return self.content == 1

    @property
    def is_positive_definite(self) -> bool:
        """True when ``D < 0`` and ``a > 0``."""
        return self.discriminant < 0 and self._a > 0

    @property
    def is_negative_definite(self) -> bool:
        """True when ``D < 0`` and ``a < 0``."""
        return self.discriminant < 0 and self._a < 0

    @property
    def is_definite(self) -> bool:
        """True when ``D < 0``."""
        return self.discriminant < 0

    @property
    def is_indefinite(self) -> bool:
        """True when ``D > 0`` and ``D`` is not a square."""
        D = self.discriminant
        return D > 0 and not is_square(D)

    @property
    def kind(self) -> str:
        """One of ``'positive definite'``, ``'negative definite'``, ``'indefinite'``,
        ``'degenerate'`` (square discriminant, including 0)."""
        D = self.discriminant
        if D < 0:
            return "positive definite" if self._a > 0 else "negative definite"
        if is_square(D):
            return "degenerate"
        return "indefinite"

    # -- arithmetic -----------------------------------------------------------
    def __call__(self, x: int, y: int) -> int:
        """Evaluate ``Q(x, y)``."""
        x = as_int(x, "x")
        y = as_int(y, "y")
        return self._a * x * x + self._b * x * y + self._c * y * y

    def transform(self, matrix: object) -> Form:
        """``Q·M``: the form ``Q(px + qy, rx + sy)`` for ``M = [[p, q], [r, s]]``.

        Any integral 2×2 matrix is accepted here (also singular ones); equivalence
        checks use :func:`as_matrix`, which insists on determinant ±1.
        """
        rows: Any = matrix
        try:
            (p, q), (r, s) = rows
        except (TypeError, ValueError) as exc:
            raise MatrixError(f"matrix must be [[p, q], [r, s]], not {matrix!r}") from exc
        p, q, r, s = (as_int(v, "matrix entry") for v in (p, q, r, s))
        a, b, c = self._a, self._b, self._c
        return Form(
            a * p * p + b * p * r + c * r * r,
            2 * a * p * q + b * (p * s + q * r) + 2 * c * r * s,
            a * q * q + b * q * s + c * s * s,
        )

    __mul__ = transform

    def __neg__(self) -> Form:
        return Form(-self._a, -self._b, -self._c)

    def opposite(self) -> Form:
        """``(a, −b, c)``: the form ``Q·diag(1, −1)``, whose class is the inverse class."""
        return Form(self._a, -self._b, self._c)

    def primitive_part(self) -> Form:
        """The form divided by its content (the zero form stays zero)."""
        g = self.content
        if g <= 1:
            return self
        return Form(self._a // g, self._b // g, self._c // g)

    def scaled(self, k: int) -> Form:
        """``k·Q``."""
        k = as_int(k, "k")
        return Form(k * self._a, k * self._b, k * self._c)

    # -- constructors -----------------------------------------------------------
    @classmethod
    def principal(cls, D: object) -> Form:
        """The principal form of discriminant ``D``: ``x² + (D mod 2)xy + ((D mod 2) − D)/4 y²``.

        Examples
        --------
        >>> Form.principal(-20), Form.principal(-23), Form.principal(13)
        (Form(1, 0, 5), Form(1, 1, 6), Form(1, 1, -3))
        """
        from .discriminants import validate_discriminant

        D = validate_discriminant(D)
        k = D % 2
        return cls(1, k, (k - D) // 4)

    @classmethod
    def prime_form(cls, D: object, p: object) -> Form:
        """The prime form of discriminant ``D`` at the prime ``p``: ``(p, b, (b² − D)/4p)``.

        ``b`` is the least non-negative solution of ``b² ≡ D (mod 4p)`` with
        ``0 ≤ b ≤ p`` (so the form is the one whose class is that of a prime ideal
        above ``p``; its inverse is ``(p, −b, ·)``).  Needs ``χ_D(p) ≠ −1``.

        Raises
        ------
        NotPrimeError
            If ``p`` is not prime.
        FormError
            If ``χ_D(p) = −1`` (``p`` is inert: no form of leading coefficient p).
        NotPrimitiveError
            If ``p`` divides the conductor of ``D`` (every form ``(p, b, c)`` of
            discriminant ``D`` then has content ``p``).

        Examples
        --------
        >>> Form.prime_form(-23, 2), Form.prime_form(-23, 3), Form.prime_form(-20, 5)
        (Form(2, 1, 3), Form(3, 1, 2), Form(5, 0, 1))
        """
        from .discriminants import validate_discriminant

        D = validate_discriminant(D)
        p = as_int(p, "p")
        if not is_probable_prime(p):
            raise NotPrimeError(f"prime form needs a prime p, not {p}")
        if kronecker(D, p) == -1:
            raise FormError(f"no prime form of discriminant {D} at p = {p}: χ_D(p) = −1 ({p} is inert)")
        if D % (p * p) == 0 and (D // (p * p)) % 4 in (0, 1):
            # p divides the conductor: every form (p, b, c) of discriminant D has p | b, c
            raise NotPrimitiveError(
                f"no primitive prime form of discriminant {D} at p = {p}: p divides the conductor "
                f"({D} = {p}²·{D // (p * p)})"
            )
        if p == 2:
            # b² ≡ D (mod 8), 0 ≤ b ≤ 2
            b = next(b for b in (0, 1, 2) if (b * b - D) % 8 == 0)
        else:
            r = int(sqrt_mod_prime(D, p))  # r ≤ p/2
            # b ≡ D (mod 2) and b ≡ ±r (mod p), 0 ≤ b ≤ p
            b = r if (r - D) % 2 == 0 else p - r
        return cls(p, b, (b * b - D) // (4 * p))

    @classmethod
    def parse(cls, text: str) -> Form:
        """Read a form from text, without evaluating it.

        Accepts ``a,b,c``, ``[a,b,c]``, ``(a,b,c)`` and polynomials in x and y such as
        ``3x^2 + 7xy - 5y^2``, ``x**2+x*y+6*y**2`` or ``-x^2 + 13 y^2``.

        Raises
        ------
        ParseError
            If the text is not one of these notations.

        Examples
        --------
        >>> Form.parse("3x^2 + 7xy - 5y^2")
        Form(3, 7, -5)
        >>> Form.parse("[1, 0, -7]")
        Form(1, 0, -7)
        """
        from .parse import parse_form_text

        return cls(*parse_form_text(text))

    # -- sympy -------------------------------------------------------------------
    def to_sympy(self, x: sympy.Symbol | None = None, y: sympy.Symbol | None = None) -> sympy.Poly:
        """The form as a ``sympy.Poly`` in ``x, y`` (symbols created if not given)."""
        import sympy

        x = x if x is not None else sympy.Symbol("x")
        y = y if y is not None else sympy.Symbol("y")
        return sympy.Poly(self._a * x**2 + self._b * x * y + self._c * y**2, x, y)

    @classmethod
    def from_sympy(cls, poly: object, x: object = None, y: object = None) -> Form:
        """Build a form from a sympy expression or ``Poly``, homogeneous of degree 2 in x, y.

        Only sympy objects are accepted: text is never handed to sympy (use
        :meth:`Form.parse` for text).  Without ``x`` and ``y`` the variables are the
        generators of a ``Poly`` (first one is x), or the free symbols of an expression
        sorted by name.

        Parameters
        ----------
        poly : sympy.Expr or sympy.Poly
            The polynomial ``a·x² + b·x·y + c·y²`` with integer coefficients.
        x, y : sympy.Symbol, optional
            The two variables (give both or neither).

        Returns
        -------
        Form

        Raises
        ------
        FormError
            If ``poly`` is text or not a sympy object, or not a binary quadratic form
            with integer coefficients.

        Examples
        --------
        >>> import sympy
        >>> X, Y = sympy.symbols("x y")
        >>> Form.from_sympy(3*X**2 + 7*X*Y - 5*Y**2)
        Form(3, 7, -5)
        >>> Form.from_sympy(Form(1, 1, 6).to_sympy())
        Form(1, 1, 6)
        >>> Form.from_sympy("x**2 + y**2")
        Traceback (most recent call last):
        ...
        formkit.errors.FormError: from_sympy takes a sympy expression or Poly, not the text 'x**2 + y**2'; use Form.parse for text
        """
        import sympy
        from sympy.polys.polyerrors import GeneratorsError, PolynomialError

        if isinstance(poly, str):
            raise FormError(
                f"from_sympy takes a sympy expression or Poly, not the text {poly!r}; use Form.parse for text"
            )
        if not isinstance(poly, sympy.Basic):
            raise FormError(
                f"from_sympy takes a sympy expression or Poly, not {poly!r} ({type(poly).__name__})"
            )
        if (x is None) != (y is None):
            raise FormError("from_sympy: give both variables x and y, or neither")
        for v in (x, y):
            if v is not None and not isinstance(v, sympy.Symbol):
                raise FormError(f"from_sympy: the variables must be sympy Symbols, not {v!r}")
        try:
            if isinstance(poly, sympy.Poly):
                P = poly if x is None else sympy.Poly(poly.as_expr(), x, y)
            else:
                if x is not None:
                    gens = [x, y]
                else:
                    gens = sorted(poly.free_symbols, key=str)
                    if len(gens) > 2:
                        raise FormError(f"a binary form has two variables; {poly} has {len(gens)}")
                    names = {str(g) for g in gens}
                    for fill in ("x", "y", "_x", "_y"):
                        if len(gens) == 2:
                            break
                        if fill not in names:
                            gens.append(sympy.Symbol(fill))
                            names.add(fill)
                P = sympy.Poly(poly, *gens)
        except (PolynomialError, GeneratorsError) as exc:
            raise FormError(f"not a polynomial in two variables: {poly!r}") from exc
        if len(P.gens) != 2:
            raise FormError(f"a binary form needs exactly two variables, not {P.gens}")
        if P.is_zero:
            return cls(0, 0, 0)
        coeffs = dict(P.terms())
        if any(sum(m) != 2 for m in coeffs):
            raise FormError(f"not homogeneous of degree 2: {P.as_expr()}")
        out = []
        for mono in ((2, 0), (1, 1), (0, 2)):
            cf = coeffs.get(mono, 0)
            if not (isinstance(cf, int) or getattr(cf, "is_Integer", False)):
                raise FormError(f"coefficient {cf} of {P.as_expr()} is not an integer")
            out.append(int(cf))
        return cls(*out)

    # -- display -----------------------------------------------------------------
    def __repr__(self) -> str:
        return f"Form({self._a}, {self._b}, {self._c})"

    def _poly_text(self, power: str, times: str) -> str:
        terms: list[tuple[str, str]] = []
        for coeff, mono in ((self._a, f"x{power}"), (self._b, f"x{times}y"), (self._c, f"y{power}")):
            if coeff == 0:
                continue
            sign = "-" if coeff < 0 else "+"
            mag = abs(coeff)
            body = mono if mag == 1 else f"{mag}{mono}"
            terms.append((sign, body))
        if not terms:
            return "0"
        first_sign, first = terms[0]
        out = ("-" if first_sign == "-" else "") + first
        for sign, body in terms[1:]:
            out += f" {sign} {body}"
        return out

    def __str__(self) -> str:
        return self._poly_text("^2", "")

    def _repr_latex_(self) -> str:
        return "$" + self._poly_text("^{2}", " ").replace("x y", "xy") + "$"

    def _repr_html_(self) -> str:
        """Notebook display: the polynomial, the triple (a, b, c) and the discriminant."""
        import html

        poly = html.escape(self._poly_text("^2", "")).replace("^2", "<sup>2</sup>")
        return f"{poly} &nbsp; ({self.a}, {self.b}, {self.c}), D = {self.discriminant}"

    def to_list(self) -> list[int]:
        """``[a, b, c]`` (for JSON)."""
        return [self._a, self._b, self._c]


FormLike = Form | Sequence[int] | str


def as_form(value: object, *, name: str = "form") -> Form:
    """Coerce a :class:`Form`, an ``(a, b, c)`` sequence or text into a :class:`Form`.

    Examples
    --------
    >>> as_form((1, 1, 6)), as_form("x^2 + 5y^2")
    (Form(1, 1, 6), Form(1, 0, 5))
    """
    if isinstance(value, Form):
        return value
    if isinstance(value, str):
        return Form.parse(value)
    try:
        items = list(value)  # type: ignore[call-overload]
    except TypeError as exc:
        raise FormError(f"{name} must be a Form, (a, b, c) or text, not {value!r}") from exc
    if len(items) != 3:
        raise FormError(f"{name} must have three coefficients (a, b, c), not {len(items)}: {value!r}")
    return Form(*items)


def _require_nonsquare(form: Form, what: str) -> int:
    D = form.discriminant
    if D == 0 or is_square(D):
        raise DiscriminantError(
            f"{what} needs a non-square discriminant; {form!r} has discriminant {D}"
            + (f" = {int(isqrt(D))}²" if D > 0 else "")
        )
    return D
