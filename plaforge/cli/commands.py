"""Registers every command module on the group (one module per command, so each can grow on its own)."""

from . import build, check, demo, hazards, inspect, luts, minimize, module  # noqa: F401
