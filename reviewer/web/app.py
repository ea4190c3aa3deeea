"""The counter page as a Flask application: :func:`create_app`.

Pages and what they take (nothing else from the browser is read):

- ``GET /``: the empty form. ``POST /upload``: a build file's bytes (the field ``build_file``)
  fill the form, with its input errors at their fields.
- ``POST /review``: the form's fields, by field path; a build with input errors comes back as
  the form with every error at its field, a valid one as the HTML review with its downloads.
- ``POST /edit``, ``/download``, ``/sign``: the build's TOML text (``build``), which the
  review page carries in hidden fields, so the server keeps nothing between requests; a
  download names its form (``toml``, ``md``, ``html``, ``json``) from a fixed list.

No path from the browser reaches the file system: a file name offered for download is made of
the vehicle's name's letters and digits only. Off loopback every request carries the access
token (``?token=``, the ``X-Firstride-Token`` header or a ``token`` form field), compared in
constant time; on loopback a request must name a loopback host, so a web page elsewhere cannot
reach the counter page through a rebound DNS name. Every response forbids fetching anything
from elsewhere (Content-Security-Policy) and is not cached.
"""

from __future__ import annotations

import hmac
import secrets
from typing import TYPE_CHECKING

from flask import Flask, Response, abort, request
from werkzeug.exceptions import HTTPException

from reviewer.web.counter import DOWNLOADS, Counter, Problems, file_name
from reviewer.web.pages import form_page, message_page, review_page

if TYPE_CHECKING:
    from werkzeug.datastructures import MultiDict

    from reviewer.loader import LoadedBuild

from reviewer.loader import MAX_BUILD_BYTES

#: The largest request taken: a build file at the loader's cap and room for the other fields.
MAX_REQUEST_BYTES = MAX_BUILD_BYTES + 256 * 1024
#: The most fields a form may have (the whole build with many rows is some hundreds).
MAX_FORM_PARTS = 20_000
TOKEN_HEADER = "X-Firstride-Token"
LOOPBACK_NAMES = frozenset({"127.0.0.1", "localhost", "::1", "[::1]"})
_CSP = (
    "default-src 'none'; style-src 'unsafe-inline'; img-src data:; script-src 'nonce-{nonce}'; "
    "form-action 'self'; base-uri 'none'; frame-ancestors 'none'"
)


def create_app(counter: Counter, token: str | None = None) -> Flask:
    """The application; ``token`` set (off loopback) makes every request carry it."""
    app = Flask(__name__, static_folder=None, template_folder=None)
    app.config.update(
        MAX_CONTENT_LENGTH=MAX_REQUEST_BYTES,
        MAX_FORM_MEMORY_SIZE=MAX_REQUEST_BYTES,
        MAX_FORM_PARTS=MAX_FORM_PARTS,
    )

    def context() -> dict[str, object]:
        nonce = request.environ.setdefault("firstride.nonce", secrets.token_urlsafe(16))
        query = f"?token={token}" if token else ""
        return {"nonce": nonce, "query": query, "token": token or "", "can_sign": counter.can_sign}

    @app.before_request
    def guard() -> None:
        if token is None:
            if host_name(request.host).lower() not in LOOPBACK_NAMES:
                abort(403, "this page answers on a loopback address only")
            return
        given = request.args.get("token") or request.headers.get(TOKEN_HEADER)
        if given is None and request.method == "POST":
            given = request.form.get("token")
        if not hmac.compare_digest((given or "").encode(), token.encode()):
            abort(403, "this page needs the access token printed when it was started")

    @app.after_request
    def headers(response: Response) -> Response:
        nonce = request.environ.get("firstride.nonce", secrets.token_urlsafe(16))
        response.headers["Content-Security-Policy"] = _CSP.format(nonce=nonce)
        response.headers["X-Content-Type-Options"] = "nosniff"
        response.headers["Referrer-Policy"] = "no-referrer"
        response.headers["Cache-Control"] = "no-store"
        return response

    @app.errorhandler(HTTPException)
    def refused(error: HTTPException) -> Response:
        if error.code == 413:
            text = f"a request of at most {MAX_REQUEST_BYTES} bytes (a build file of at most "
            text += f"{MAX_BUILD_BYTES} bytes); this one is larger"
        else:
            text = str(error.description or error.name)
        page = message_page(counter, context(), f"{error.code} {error.name}", text)
        return Response(page, status=error.code, mimetype="text/html")

    @app.get("/")
    def blank() -> str:
        return form_page(counter, context(), {})

    @app.post("/upload")
    def upload() -> str:
        sent = request.files.get("build_file")
        if sent is None:
            return form_page(counter, context(), {}, [("(file)", "a build file to upload")])
        raw = sent.stream.read(MAX_BUILD_BYTES + 1)  # never more than the loader's cap
        values, errors, notes = counter.uploaded(raw)
        return form_page(counter, context(), values, errors, notes, loaded=not errors)

    @app.post("/review")
    def review() -> str:
        values = _values(request.form)
        text, tree = counter.from_form(values)
        try:
            loaded = counter.load(text.encode("utf-8"), file_name(tree.tree), tree)
        except Problems as found:
            return form_page(counter, context(), values, found.errors)
        result = counter.review(loaded)
        html = counter.render(result, "html")
        return review_page(counter, context(), html, text)

    @app.post("/edit")
    def edit() -> str:
        values, errors, notes = counter.uploaded(_build_bytes())
        return form_page(counter, context(), values, errors, notes)

    @app.post("/download")
    def download() -> Response:
        form = request.form.get("form", "")
        if form not in DOWNLOADS:
            abort(400, "one of " + ", ".join(DOWNLOADS))
        raw = _build_bytes()
        loaded, name = _loaded(raw)
        stem = name.removesuffix(".toml")
        suffix, media = DOWNLOADS[form]
        if form == "toml":
            body = raw.decode("utf-8")
            saved = name
        else:
            body = counter.render(counter.review(loaded), form)
            saved = f"{stem}-review.{suffix}"
        return _attachment(body, saved, media)

    @app.post("/sign")
    def sign() -> Response | str:
        raw = _build_bytes()
        loaded, name = _loaded(raw)
        result = counter.review(loaded)
        signer, role = request.form.get("signer", ""), request.form.get("role", "")
        try:
            signed = counter.sign(result, signer, role)
        except Problems as found:
            html = counter.render(result, "html")
            sign_form = {"signer": signer, "role": role, "errors": found.errors}
            return review_page(counter, context(), html, raw.decode("utf-8"), sign_form)
        stem = name.removesuffix(".toml")
        return _attachment(signed, f"{stem}-review-signed.md", "text/markdown")

    def _loaded(raw: bytes) -> tuple[LoadedBuild, str]:
        """A build the review page sent back, validated again, and its file name."""
        from reviewer.errors import InputError
        from reviewer.inputs import load_toml

        try:
            name = file_name(load_toml(raw.decode("utf-8", "replace"), "build"))
        except InputError:
            name = "build.toml"
        try:
            return counter.load(raw, name), name
        except Problems as found:
            text = "; ".join(f"{path}: {message}" for path, message in found.errors)
            abort(400, text)

    return app


def _values(form: MultiDict[str, str]) -> dict[str, str]:
    """The submitted fields, each once (its last value)."""
    return {key: form.getlist(key)[-1] for key in form if key != "token"}


def _build_bytes() -> bytes:
    text = request.form.get("build", "")
    if not text.strip():
        abort(400, "a build, as the review page sends it")
    # a browser sends a field's line breaks as CR LF; the page writes LF only (a CR in a
    # string is escaped), so this gives back the bytes the page wrote
    return text.replace("\r\n", "\n").encode("utf-8")


def _attachment(body: str, name: str, media: str) -> Response:
    response = Response(body, mimetype=media)
    response.headers["Content-Disposition"] = f'attachment; filename="{name}"'
    return response


def host_name(host: str) -> str:
    """The name part of a Host header (``[::1]:8750`` gives ``[::1]``)."""
    if host.startswith("["):
        return host[: host.find("]") + 1]
    return host.rsplit(":", 1)[0] if host.count(":") == 1 else host


def new_token() -> str:
    """A fresh access token (about 190 bits, URL-safe)."""
    return secrets.token_urlsafe(24)
