"""Verification of every artifact against the source Table."""

from .equivalence import OutputVerdict, Verdict, check_cover, check_network
from .report import format_vector, format_verdict
from .sat import sat_check_cover, sat_check_network
from .simulate import check_component

__all__ = [
    "OutputVerdict",
    "Verdict",
    "check_component",
    "check_cover",
    "check_network",
    "format_vector",
    "format_verdict",
    "sat_check_cover",
    "sat_check_network",
]
