"""``class_group(D)``: which method computes Cl(D), and a cache of the results.

Up to :data:`ENUMERATION_LIMIT` (D < 0) and :data:`REAL_ENUMERATION_LIMIT` (D > 0) the
classes are enumerated (:mod:`formkit.classgroups.enumerated`, unconditional); beyond,
baby-step giant-step (:mod:`formkit.classgroups.baby_step_giant_step`, D < 0) or the
infrastructure of the principal cycle (:mod:`formkit.classgroups.infrastructure`,
D > 0) give results conditional on GRH.  :func:`class_number_summary` gives the class
numbers (and for D > 0 the regulator) without the structure, by the same choice.
Every result says how it was obtained (:class:`formkit.classgroups.group.Provenance`).
"""

from __future__ import annotations

from ..core.discriminants import validate_discriminant
from ..errors import FormkitError
from .group import ClassGroup

__all__ = [
    "class_group",
    "class_number_summary",
    "ENUMERATION_LIMIT",
    "REAL_ENUMERATION_LIMIT",
    "METHODS",
]

#: The method names: the option values of ``formkit group --method`` and the ``"method"`` of
#: the results (a method chosen by name comes back under that name).  ``"subexponential"``
#: (:mod:`formkit.classgroups.subexponential`, fundamental D < 0 only) is never chosen by
#: ``"auto"`` yet: at 18 digits it is slower than baby-step giant-step here (11 s CPU).
METHODS = ("auto", "enumeration", "bsgs", "subexponential")
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

_GROUP_CACHE: dict[int, ClassGroup] = {}


def _infrastructure_path(D: int, method: str) -> bool:
    """True when ``D > 0`` is handled by :mod:`formkit.classgroups.infrastructure` (GRH) for ``method``."""
    return D > 0 and (method == "bsgs" or (method == "auto" and D > REAL_ENUMERATION_LIMIT))


def class_group(D: object, method: str = "auto") -> ClassGroup:
    """The class group of discriminant ``D`` with its structure.

    Parameters
    ----------
    D : int
        A non-square discriminant (fundamental or not, negative or positive).
    method : {"auto", "enumeration", "bsgs", "subexponential"}
        ``"subexponential"`` uses relations among prime forms under GRH (fundamental D < 0,
        :mod:`formkit.classgroups.subexponential`);
        ``"enumeration"`` (older spelling ``"enumerate"``) lists every class (unconditional, about √|D| work);
        ``"bsgs"`` uses baby-step giant-step under GRH (D < 0: see
        :mod:`formkit.classgroups.baby_step_giant_step`; D > 0: the infrastructure and class orders of
        :mod:`formkit.classgroups.infrastructure`); ``"auto"`` enumerates up to
        :data:`ENUMERATION_LIMIT` for D < 0 and :data:`REAL_ENUMERATION_LIMIT` for D > 0.

    Returns
    -------
    ClassGroup
        With ``provenance`` saying how it was obtained.

    Raises
    ------
    DiscriminantError
        If ``D`` is not a discriminant.

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
    method = _METHOD_ALIASES.get(method, method)
    if method not in METHODS:
        raise FormkitError(
            f"method must be 'auto', 'enumeration', 'bsgs' or 'subexponential', not {method!r}"
        )
    if method == "subexponential":
        from .subexponential import class_group_subexponential

        return class_group_subexponential(D)
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

    For ``D > 0`` above :data:`REAL_ENUMERATION_LIMIT` (or with ``method="bsgs"``) this is
    :func:`formkit.classgroups.infrastructure.real_class_number`, which needs no cycle walk beyond
    ``√(h·R)`` steps and so reaches much further than :func:`class_group`.

    Parameters
    ----------
    D : int
        A non-square discriminant.
    method : {"auto", "enumeration", "bsgs"}
        As for :func:`class_group`.
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
        If ``method`` is unknown, or (D > 0) the class number is not determined.

    Examples
    --------
    >>> r = class_number_summary(4 * 79)
    >>> r["class_number_narrow"], r["class_number"], r["fundamental_unit_norm"], r["method"]
    (6, 3, 1, 'enumeration')
    >>> class_number_summary(-23)["class_number"]
    3
    """
    D = validate_discriminant(D)
    method = _METHOD_ALIASES.get(method, method)
    if method not in METHODS:
        raise FormkitError(
            f"method must be 'auto', 'enumeration', 'bsgs' or 'subexponential', not {method!r}"
        )
    if _infrastructure_path(D, method):
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
