"""Separate pins for pin-and-slot couplings (a round bar; see :mod:`.arbor`)."""

from __future__ import annotations

from .arbor import make_pin

__all__ = ["make_pin"]
