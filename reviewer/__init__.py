"""firstride: design review of a home-built light electric vehicle before its first ride."""

from __future__ import annotations

import pluggy

__version__ = "0.1.0"

#: Mark a rule pack's hook implementations: ``@hookimpl def firstride_register_rules(): ...``
hookimpl = pluggy.HookimplMarker("firstride")

__all__ = ["__version__", "hookimpl"]
