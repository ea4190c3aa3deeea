"""``firstride serve``: the counter page, a form in the browser that reviews and signs a build.

It binds 127.0.0.1 unless told otherwise. Another address needs ``--allow-network`` as well,
and then every request must carry the access token printed at start. ``--key`` reads a
private key file once, here; the page signs with it and never sends it.
"""

from __future__ import annotations

import argparse
import ipaddress
import sys

from reviewer.commands import EXIT_GO
from reviewer.commands.pack_options import add_pack_arguments, packs_from
from reviewer.errors import InputError

NAME = "serve"
HELP = "the counter page: fill in a build in the browser, read, download and sign its review"
DEFAULT_PORT = 8750


def add_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument(
        "--host", default="127.0.0.1", help="the address to bind (default 127.0.0.1, loopback)"
    )
    parser.add_argument(
        "--allow-network",
        action="store_true",
        help="needed to bind an address other than loopback; every request then carries the "
        "access token printed at start",
    )
    parser.add_argument(
        "--port", type=_port, default=DEFAULT_PORT, help=f"default {DEFAULT_PORT}; 0 picks one"
    )
    parser.add_argument(
        "--key", help="a private key file (from keygen) the page may sign reviews with"
    )
    parser.add_argument("--profile", help="a profile of limits (TOML); default: built-in")
    add_pack_arguments(parser)


def _port(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"a port number, not {text!r}") from None
    if not 0 <= value <= 65535:
        raise argparse.ArgumentTypeError("a port number from 0 to 65535")
    return value


def is_loopback(host: str) -> bool:
    if host.lower() == "localhost":
        return True
    try:
        return ipaddress.ip_address(host.strip("[]")).is_loopback
    except ValueError:
        return False


def run(args: argparse.Namespace) -> int:
    loopback = is_loopback(args.host)
    if not loopback and not args.allow_network:
        raise InputError(
            "--host",
            "(usage)",
            f"a loopback address, or --allow-network to serve {args.host} to the network "
            "(every request then needs the printed access token)",
        )
    import importlib.util

    if importlib.util.find_spec("flask") is None:
        raise InputError("serve", "(usage)", "the web extra: pip install 'firstride[web]'")
    from werkzeug.serving import make_server

    from reviewer.session import open_session
    from reviewer.web.app import create_app, new_token
    from reviewer.web.counter import Counter
    from reviewer.web.server import QuietHandler

    key = None
    if args.key:
        from reviewer.signing_keys import load_private_key

        key = load_private_key(args.key, "--key")
    session = open_session(args.profile, lambda: packs_from(args))
    token = None if loopback else new_token()
    app = create_app(Counter(session, key), token)
    try:
        server = make_server(args.host, args.port, app, threaded=True, request_handler=QuietHandler)
    except OSError as exc:
        raise InputError("--port", "(usage)", f"a free port ({exc.strerror or exc})") from None
    shown_host = f"[{args.host}]" if ":" in args.host else args.host
    address = f"http://{shown_host}:{server.server_port}/"
    if token:
        address += f"?token={token}"
        print(f"firstride: access token {token} (every request must carry it)", file=sys.stderr)
    print(f"firstride: the counter page is at {address} (Ctrl-C stops it)", flush=True)
    try:
        server.serve_forever()
    except KeyboardInterrupt:
        print("firstride: the counter page has stopped", file=sys.stderr)
    finally:
        server.server_close()
    return EXIT_GO
