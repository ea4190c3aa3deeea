"""One module per command-line verb. Each exposes ``NAME``, ``HELP``, ``add_arguments(parser)``
and ``run(args) -> int``; :mod:`reviewer.cli` wires them up and owns errors and exit codes."""

from __future__ import annotations

EXIT_GO = 0
EXIT_FINDINGS = 1
EXIT_INPUT = 2

#: Module names under reviewer.commands, in the order ``firstride --help`` lists them.
VERBS = ("review", "sweep", "rules", "schema", "keygen", "sign", "verify", "new-pack", "serve")
