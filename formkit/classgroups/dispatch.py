"""``class_group(D)``: which method computes Cl(D), and a cache of the results.

Up to :data:`ENUMERATION_LIMIT` (D < 0) and :data:`REAL_ENUMERATION_LIMIT` (D > 0) the
classes are enumerated (:mod:`formkit.classgroups.enumerated`, unconditional); beyond,
baby-step giant-step (:mod:`formkit.classgroups.baby_step_giant_step`, D < 0) up to
:data:`SUBEXPONENTIAL_FROM` and the subexponential method above
(:mod:`formkit.classgroups.subexponential`, orders through
:mod:`formkit.classgroups.subexponential_orders`), or for D > 0 the
infrastructure of the principal cycle (:mod:`formkit.classgroups.infrastructure`), for
fundamental D > 0 from :data:`REAL_SUBEXPONENTIAL_FROM` on the subexponential method with the
regulator (:mod:`formkit.classgroups.subexponential_real`), give results conditional on GRH (:func:`chosen_method` names the choice).  :func:`class_number_summary` gives the class
numbers (and for D > 0 the regulator) without the structure, by the same choice.
Every result says how it was obtained (:class:`formkit.classgroups.group.Provenance`).
"""

from __future__ import annotations

from ..core.discriminants import discriminant_parts, validate_discriminant
from ..errors import FormkitError
from .group import ClassGroup

__all__ = [
    "class_group",
    "class_number_summary",
    "ENUMERATION_LIMIT",
    "REAL_ENUMERATION_LIMIT",
    "SUBEXPONENTIAL_FROM",
    "REAL_SUBEXPONENTIAL_FROM",
    "chosen_method",
    "METHODS",
    "SUMMARY_METHODS",
]

#: The method names: the option values of ``formkit group --method`` and the ``"method"`` of
#: the results (a method chosen by name comes back under that name; under ``"auto"`` the
#: method chosen).  ``"subexponential"`` (:mod:`formkit.classgroups.subexponential`, D < 0,
#: orders through the maximal order) is chosen by ``"auto"`` from :data:`SUBEXPONENTIAL_FROM`
#: on, and for fundamental D > 0 (:mod:`formkit.classgroups.subexponential_real`) from
#: :data:`REAL_SUBEXPONENTIAL_FROM` on.
METHODS = ("auto", "enumeration", "bsgs", "subexponential")
#: The methods of :func:`class_number_summary` (``formkit class-number --method``): those of
#: :func:`class_group`, and ``"infrastructure"`` (D > 0 only: the
#: regulator by the infrastructure and ``h`` from the analytic interval, no structure).  The
#: ``"method"`` of a summary is the method run: the one asked for, or under ``"auto"`` the one
#: chosen.
SUMMARY_METHODS = ("auto", "enumeration", "bsgs", "subexponential", "infrastructure")
_METHOD_ALIASES = {"enumerate": "enumeration"}

#: Largest |D| for which ``class_group(D, method="auto")`` enumerates when D < 0
#: (about √|D| work); above it the baby-step giant-step path of
#: :mod:`formkit.classgroups.baby_step_giant_step` is used when present.
ENUMERATION_LIMIT = (
    10**11
)  # benchmarks/bench_large_discriminants.py: enumeration ≈ 2 s CPU here (unconditional), 13.6 s at 10^12; bsgs < 0.2 s
#: For D > 0, ``method="auto"`` enumerates up to this D (about 2 s here at 10^9, 10 s at
#: 10^10, 3 min at 10^12) and uses :func:`formkit.classgroups.infrastructure.real_class_group` above.
REAL_ENUMERATION_LIMIT = 10**9
#: From this |D| on, ``method="auto"`` uses the subexponential method for D < 0 (fundamental or
#: not) instead of baby-step giant-step.  Measured with benchmarks/bench_auto_choice.py
#: (docs/performance.md, "Automatic choice of the method"; medians of 3 random fundamental D,
#: CPU s, subexponential / BSGS): 26 digits 2.4 / 2.4, 28 digits 1.1 / 1.5, 30 digits 3.8 / 5.1,
#: 32 digits 4.5 / 8.0, 34 digits 6.5 / 12.1; equal at 26 digits, faster from 28 digits on.
SUBEXPONENTIAL_FROM = 10**27
#: From this D on, ``method="auto"`` uses the subexponential method for fundamental D > 0
#: (:mod:`formkit.classgroups.subexponential_real`) instead of the infrastructure (which stays
#: for non-fundamental D).  Measured with benchmarks/bench_subexponential_real.py on
#: 2026-12-04 (docs/performance.md, "D > 0"; medians of 3 random fundamental D, CPU s,
#: subexponential / ``real_class_group``): 20 digits 2.2 / 0.46, 21 digits 2.1 / 0.51,
#: 22 digits 1.6 / 1.5, 23 digits 3.2 / 2.7, 24 digits 2.2 / 6.8; the infrastructure's
#: cost grows with the regulator (about √D) and reaches its limit near 10^26.
REAL_SUBEXPONENTIAL_FROM = 10**23

_GROUP_CACHE: dict[int, ClassGroup] = {}


def _infrastructure_path(D: int, method: str) -> bool:
    """True when ``D > 0`` is handled by :mod:`formkit.classgroups.infrastructure` (GRH) for ``method``."""
    return D > 0 and (method == "bsgs" or (method == "auto" and D > REAL_ENUMERATION_LIMIT))


def _check_method(D: int, method: str, allowed: tuple[str, ...]) -> str:
    """The method name (aliases resolved), or a FormkitError saying why it cannot run for ``D``."""
    method = _METHOD_ALIASES.get(method, method)
    if method not in allowed:
        names = ", ".join(repr(m) for m in allowed)
        extra = ""
        if method == "infrastructure":
            extra = (
                " ('infrastructure' gives the class numbers and the regulator, not the structure: "
                "class_number_summary, formkit class-number)"
            )
        raise FormkitError(f"method must be one of {names}, not {method!r}{extra}")
    if method == "infrastructure" and D < 0:
        raise FormkitError(
            f"method 'infrastructure' (the regulator of a real quadratic order) needs D > 0, not "
            f"D = {D}; for D < 0 use 'bsgs' (baby-step giant-step) or 'enumeration'"
        )
    return method


def chosen_method(D: object, method: str = "auto") -> str:
    """The method :func:`class_group` runs for ``D`` when asked for ``method``.

    ``"auto"`` resolves by size: ``"enumeration"`` up to :data:`ENUMERATION_LIMIT`
    (:data:`REAL_ENUMERATION_LIMIT` for D > 0), then for D < 0 ``"bsgs"`` below
    :data:`SUBEXPONENTIAL_FROM` and ``"subexponential"`` from it on, for D > 0 ``"bsgs"``
    (the infrastructure of :mod:`formkit.classgroups.infrastructure`), for fundamental
    D > 0 from :data:`REAL_SUBEXPONENTIAL_FROM` on ``"subexponential"``.

    Examples
    --------
    >>> [chosen_method(D) for D in (-4004, -10**20 - 3, -10**40 - 3, 10**20 + 1, 10**30 + 1)]
    ['enumeration', 'bsgs', 'subexponential', 'bsgs', 'subexponential']
    >>> chosen_method(9 * (10**30 + 1))  # not fundamental: the infrastructure
    'bsgs'
    >>> chosen_method(-4004, "enumerate")
    'enumeration'
    """
    D = validate_discriminant(D)
    method = _check_method(D, method, METHODS)
    if method != "auto":
        return method
    if D > 0:
        if D >= REAL_SUBEXPONENTIAL_FROM and discriminant_parts(D)[1] == 1:
            return "subexponential"
        return "bsgs" if D > REAL_ENUMERATION_LIMIT else "enumeration"
    if -D >= SUBEXPONENTIAL_FROM:
        return "subexponential"
    return "bsgs" if -D > ENUMERATION_LIMIT else "enumeration"


def class_group(D: object, method: str = "auto") -> ClassGroup:
    """The class group of discriminant ``D`` with its structure.

    Parameters
    ----------
    D : int
        A non-square discriminant (fundamental or not, negative or positive).
    method : {"auto", "enumeration", "bsgs", "subexponential"}
        ``"subexponential"`` uses relations among prime forms under GRH (D < 0,
        :mod:`formkit.classgroups.subexponential`; non-fundamental D through the maximal
        order and the class number formula, :mod:`formkit.classgroups.subexponential_orders`);
        ``"enumeration"`` (older spelling ``"enumerate"``) lists every class (unconditional, about √|D| work);
        ``"bsgs"`` uses baby-step giant-step under GRH (D < 0: see
        :mod:`formkit.classgroups.baby_step_giant_step`; D > 0: the infrastructure and class orders of
        :mod:`formkit.classgroups.infrastructure`); ``"auto"`` enumerates up to
        :data:`ENUMERATION_LIMIT` for D < 0 and :data:`REAL_ENUMERATION_LIMIT` for D > 0,
        then runs ``"bsgs"``, for D < 0 from :data:`SUBEXPONENTIAL_FROM` on
        ``"subexponential"`` (:func:`chosen_method`).

    Returns
    -------
    ClassGroup
        With ``provenance`` saying how it was obtained.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.
    FormkitError
        If ``method`` is unknown (``"infrastructure"`` gives no structure: see
        :func:`class_number_summary`).

    Examples
    --------
    >>> G = class_group(-56)
    >>> G.order, G.invariants, G.structure
    (4, (4,), 'C4')
    >>> H = class_group(4 * 79)
    >>> H.class_number_narrow, H.class_number, H.invariants
    (6, 3, (6,))
    """
    D = validate_discriminant(D)
    method = _check_method(D, method, METHODS)
    if chosen_method(D, method) == "subexponential":
        from .subexponential_orders import class_group_subexponential_order

        return class_group_subexponential_order(D)
    if _infrastructure_path(D, method):
        from .infrastructure import real_class_group

        return real_class_group(D)
    if method == "bsgs" or (method == "auto" and D < 0 and -D > ENUMERATION_LIMIT):
        try:
            from .baby_step_giant_step import class_group_bsgs
        except ImportError as exc:  # pragma: no cover - until that module exists
            raise FormkitError(
                f"|D| = {abs(D)} exceeds the enumeration limit {ENUMERATION_LIMIT} and no "
                "baby-step giant-step module is available"
            ) from exc
        return class_group_bsgs(D)
    cached = _GROUP_CACHE.get(D)
    if cached is None:
        from .enumerated import class_group_enumerated

        cached = class_group_enumerated(D)
        if len(_GROUP_CACHE) > 64:
            _GROUP_CACHE.clear()
        _GROUP_CACHE[D] = cached
    return cached


def class_number_summary(D: object, method: str = "auto", *, interval: bool = False) -> dict:
    """The class number(s) of ``D`` and, for ``D > 0``, the regulator, without the structure.

    For ``D > 0`` above :data:`REAL_ENUMERATION_LIMIT` (or with ``method="infrastructure"``)
    this is :func:`formkit.classgroups.infrastructure.real_class_number`, which needs no cycle
    walk beyond ``√(h·R)`` steps and so reaches much further than :func:`class_group`.

    Parameters
    ----------
    D : int
        A non-square discriminant.
    method : {"auto", "enumeration", "bsgs", "subexponential", "infrastructure"}
        ``"enumeration"``, ``"bsgs"`` and ``"subexponential"`` (``D < 0``) as for
        :func:`class_group` (for ``D > 0``, ``"bsgs"``
        finds the structure by baby-step giant-step among the classes, which needs short
        cycles of reduced forms); ``"infrastructure"`` (``D > 0``): the regulator by the
        infrastructure and ``h`` from the analytic interval under GRH; ``"auto"``: enumeration
        up to the limits of :func:`class_group`, then ``"bsgs"`` and from
        :data:`SUBEXPONENTIAL_FROM` on ``"subexponential"`` (``D < 0``), or
        ``"infrastructure"`` (``D > 0``; ``"subexponential"`` for fundamental ``D`` from
        :data:`REAL_SUBEXPONENTIAL_FROM` on).  The ``"method"`` of the result is the method run.
    interval : bool
        Also give ``analytic_interval``: the interval for ``h`` (``D < 0``) or ``h·R``
        (``D > 0``) from :func:`formkit.analytic.lseries.class_number_estimate` (primes up to
        ``min(2·10^6, |D|)`` or the default bound if larger), which holds under GRH.

    Returns
    -------
    dict
        ``discriminant``, ``class_number`` (``h``: ideal classes of the order),
        ``class_number_narrow`` (``h⁺``: forms up to proper equivalence; ``= h`` for
        ``D < 0``) and, for ``D > 0``, ``regulator`` (float) and ``fundamental_unit_norm``; then
        ``method``, ``certified``, ``assumption``, ``bound`` and ``detail`` saying how
        the result was obtained.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a non-square discriminant.
    FormkitError
        If ``method`` is unknown or cannot run for ``D`` (``"infrastructure"`` with
        ``D < 0``), or (D > 0) the class number is not determined.

    Examples
    --------
    >>> r = class_number_summary(4 * 79)
    >>> r["class_number_narrow"], r["class_number"], r["fundamental_unit_norm"], r["method"]
    (6, 3, 1, 'enumeration')
    >>> class_number_summary(-23)["class_number"]
    3
    >>> [class_number_summary(316, m)["method"] for m in ("bsgs", "infrastructure")]
    ['bsgs', 'infrastructure']
    """
    D = validate_discriminant(D)
    method = _check_method(D, method, SUMMARY_METHODS)
    if method == "infrastructure" or (method == "auto" and D > 0 and chosen_method(D) == "bsgs"):
        from .infrastructure import real_class_number

        r = real_class_number(D)
        out = {
            "discriminant": D,
            "class_number": r.class_number,
            "class_number_narrow": r.class_number_narrow,
            "regulator": r.regulator,
            "fundamental_unit_norm": r.unit_norm,
        }
        out.update(r.provenance.to_dict())
    else:
        G = class_group(D, method)
        out = {"discriminant": D, "class_number": G.class_number, "class_number_narrow": G.order}
        if D > 0:
            full = G.to_dict()
            out.update(
                regulator=full["regulator"],
                fundamental_unit_norm=full["fundamental_unit_norm"],
            )
        out.update(G.provenance.to_dict())
    if interval:
        from ..analytic.lseries import class_number_estimate, default_prime_bound

        est = class_number_estimate(D, max(default_prime_bound(D), min(2 * 10**6, abs(D))))
        out["analytic_interval"] = {
            "of": "h" if D < 0 else "h*R",
            "lower": est.lower,
            "upper": est.upper,
            "estimate": est.estimate,
            "prime_bound": est.l_value.prime_bound,
            "assumption": est.assumption,
        }
    return out
