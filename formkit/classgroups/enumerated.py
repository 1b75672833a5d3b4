"""Structure of an enumerated class group: relations, Smith normal form, discrete logs.

Starting from prime forms of small primes, then any class not yet reached, the group is
built one generator at a time; the new generator ``g`` contributes the relation
``g^m = (a product of earlier generators)`` with ``m`` minimal, and every class gets its
exponent vector on those generators.  A Smith normal form ``U·R·V = diag(n_i)`` of the
relation matrix ``R`` (:func:`formkit.core.lattice.lattice_quotient`) then gives the invariant factors,
generators of exactly those orders and the discrete logarithm of every class (Cohen GTM
138, §2.4.3 and §5.5).  Used by :func:`formkit.classgroups.dispatch.class_group` for enumerated
groups; the results are unconditional.

References
----------
.. [1] H. Cohen, *A Course in Computational Algebraic Number Theory*, GTM 138,
       Springer 1993, §2.4.3, §5.5.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Sequence

from ..core.arith import isqrt, kronecker
from ..core.composition import _compose_raw
from ..core.enumeration import _cycles_cached, _reduced_forms_cached
from ..core.forms import Form
from ..core.lattice import lattice_quotient
from ..core.raw_reduction import _reduce_definite_raw, _reduce_indefinite_raw
from ..errors import FormkitError
from .group import ENUMERATED, ClassGroup, Triple

__all__ = ["class_group_enumerated"]


def _canonical_function(D: int) -> Callable[[Triple], Triple]:
    if D < 0:

        def canon(x: Triple) -> Triple:
            a, b, c = _reduce_definite_raw(*x)
            return (int(a), int(b), int(c))

        return canon
    _reps, index = _cycles_cached(D)
    sq = int(isqrt(D))

    def canon_pos(x: Triple) -> Triple:
        a, b, c = _reduce_indefinite_raw(*x, D, sq)
        return index[(int(a), int(b), int(c))]

    return canon_pos


def _candidate_generators(
    D: int, canon: Callable[[Triple], Triple], forms: Sequence[Triple]
) -> Iterator[Triple]:
    from ..core.arith import next_prime

    p = 2
    limit = 60
    while p < limit:
        if kronecker(D, p) != -1:
            try:
                f = Form.prime_form(D, p)
            except FormkitError:  # p divides the conductor: no primitive prime form
                f = None
            if f is not None and f.is_primitive:
                yield canon(f.coefficients)
        p = int(next_prime(p))
    yield from forms


def _structure_from_table(
    D: int, forms: Sequence[Triple], canon: Callable[[Triple], Triple], identity: Triple
) -> tuple[tuple[int, ...], tuple[Triple, ...], Callable[[Triple], tuple[int, ...]]]:
    h = len(forms)

    def mul(x: Triple, y: Triple) -> Triple:
        return canon(_compose_raw(*x, *y, D))

    table: dict[Triple, tuple[int, ...]] = {identity: ()}
    gens: list[Triple] = []
    rels: list[list[int]] = []
    for g in _candidate_generators(D, canon, forms):
        if len(table) >= h:
            break
        if g in table:
            continue
        powers = [identity, g]
        x = g
        while x not in table:
            x = mul(x, g)
            powers.append(x)
        m = len(powers) - 1
        vec = table[x]
        rels = [r + [0] for r in rels]
        rels.append([-v for v in vec] + [m])
        gens.append(g)
        new_table: dict[Triple, tuple[int, ...]] = {}
        for y, v in table.items():
            for j in range(m):
                new_table[mul(y, powers[j]) if j else y] = v + (j,)
        table = new_table
    if len(table) != h:  # pragma: no cover - would mean the enumeration is wrong
        raise ArithmeticError(f"structure of Cl({D}): reached {len(table)} of {h} classes")
    k = len(gens)
    if k == 0:
        return (), (), lambda x: ()
    quotient = lattice_quotient(rels, ncols=k)
    invariants = quotient.invariants
    if quotient.order != h or not quotient.is_finite:  # pragma: no cover - internal check
        raise ArithmeticError(f"structure of Cl({D}): the relations give order {quotient.order}, not {h}")

    def power(x: Triple, e: int) -> Triple:
        if e < 0:
            a, b, c = x
            x = canon((a, -b, c))
            e = -e
        result = identity
        while e:
            if e & 1:
                result = mul(result, x)
            e >>= 1
            if e:
                x = mul(x, x)
        return result

    new_gens = []
    for vec in quotient.generators:
        y = identity
        for i in range(k):
            if vec[i]:
                y = mul(y, power(gens[i], vec[i]))
        new_gens.append(y)

    def dlog(x: Triple) -> tuple[int, ...]:
        return quotient.coordinates(table[x])

    return invariants, tuple(new_gens), dlog


def class_group_enumerated(D: int) -> ClassGroup:
    """The class group of ``D`` from the complete list of classes (unconditional)."""
    if D < 0:
        forms = list(_reduced_forms_cached(D))
    else:
        forms = list(_cycles_cached(D)[0])
    canon = _canonical_function(D)
    identity = canon(tuple(Form.principal(D)))  # type: ignore[arg-type]
    invariants, gens, dlog = _structure_from_table(D, forms, canon, identity)
    return ClassGroup(
        D,
        invariants=invariants,
        generators=gens,
        dlog=dlog,
        canonical=canon,
        provenance=ENUMERATED,
        forms=forms,
    )
