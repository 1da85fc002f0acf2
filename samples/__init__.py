"""Bundled sample specs, installed as the package data ``plaforge.samples`` (see plaforge/bundled.py)."""
