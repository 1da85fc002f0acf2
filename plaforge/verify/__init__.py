"""Verification of every artifact against the source Table."""

from .equivalence import OutputVerdict, Verdict, check_cover, check_network

__all__ = ["OutputVerdict", "Verdict", "check_cover", "check_network"]
