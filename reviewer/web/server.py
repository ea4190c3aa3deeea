"""Werkzeug's own server, as the counter page runs it: one line per request on stderr, naming
the method, the path and the status, never the query (which carries the access token)."""

from __future__ import annotations

import re
import sys
from typing import Any

from werkzeug.serving import WSGIRequestHandler

from reviewer.errors import shown

_QUERY = re.compile(r"\?[^\s'\"]*")


class QuietHandler(WSGIRequestHandler):
    def log_request(self, code: Any = "-", size: Any = "-") -> None:
        path = getattr(self, "path", "").split("?", 1)[0]
        print(f"firstride: {self.command} {shown(path, 200)} {code}", file=sys.stderr)

    def log(self, type: str, message: str, *args: Any) -> None:
        text = _QUERY.sub("?...", message % args if args else message)
        print(f"firstride: {type}: {shown(text, 300)}", file=sys.stderr)
