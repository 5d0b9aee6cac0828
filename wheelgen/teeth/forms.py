"""The registry of tooth forms: each form's name and the generator of its outline.

A tooth generator (:mod:`.involute_tooth`, :mod:`.triangular`) takes a
:class:`~wheelgen.teeth.spec.ToothSpec` and returns a
:class:`~wheelgen.teeth.outline.WheelOutline`; this module, above them all, maps the
spec's ``form`` to its generator, so that the spec never imports a generator and the
generators never import each other. Adding a form: write its generator, add its name
to :data:`wheelgen.teeth.spec.FORMS` and its generator to :data:`GENERATORS`.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from functools import lru_cache
from types import MappingProxyType

from .involute_tooth import involute_outline
from .outline import WheelOutline
from .spec import FORMS, ToothSpec
from .triangular import triangular_outline

__all__ = ["GENERATORS", "outline_for"]

#: Each tooth form's generator: a spec of that form in, the wheel's outline out.
GENERATORS: Mapping[str, Callable[[ToothSpec], WheelOutline]] = MappingProxyType(
    {"involute": involute_outline, "triangular": triangular_outline}
)

if tuple(GENERATORS) != FORMS:  # pragma: no cover - caught by any import
    raise ImportError(f"tooth forms {FORMS} and generators {tuple(GENERATORS)} differ")


@lru_cache(maxsize=256)
def outline_for(spec: ToothSpec) -> WheelOutline:
    """The wheel outline of ``spec``, from the generator of its form.

    Outlines are kept for the specs asked most recently: a large train repeats its
    wheels, and every check asks again. Treat the result as read-only.
    """
    return GENERATORS[spec.form](spec)
