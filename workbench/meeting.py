"""The live review meeting: one JupyterLab server with real-time collaboration.

``make meeting`` (``python -m workbench.meeting``) starts JupyterLab on the
review notebook ``notebooks/review_meeting.ipynb``. With the
``jupyter-collaboration`` extension installed, everyone who opens the printed
link edits the same notebook and shares its one kernel: when the chair moves a
slider, every participant's charts update; a participant can type in the notes
cell while the others watch.

Security, in plain words: anyone who can open the link can run any code as the
user who started the server, on this machine. So:

- the server listens on 127.0.0.1 unless ``--host`` (``HOST=`` for make) says
  otherwise, and prints a warning when it listens on any other address;
- it always needs a secret: a random token (:func:`secrets.token_urlsafe`, new
  for each meeting, or ``$HEATPATH_MEETING_TOKEN``) or a password set with
  ``make meeting-password``; it refuses to start with an empty or short token,
  and the identity provider below refuses to serve without either;
- the token reaches the server through its environment (``JUPYTER_TOKEN``), not
  its command line, which other users of the machine can read.

Each participant shows under a name they choose: the link ends with
``&name=YOUR_NAME``, and :class:`MeetingIdentityProvider` (a jupyter_server
``PasswordIdentityProvider``) takes that name for the participant's cursor and
presence in the shared notebook. Without a name a participant is "Anonymous"
with a random moon name (jupyter_server's default).
"""

from __future__ import annotations

import argparse
import colorsys
import getpass
import hashlib
import ipaddress
import json
import os
import re
import secrets
import socket
import sys
import unicodedata
import uuid
from dataclasses import dataclass, field
from pathlib import Path
from urllib.parse import parse_qs, quote, urlparse

from jupyter_server.auth.identity import PasswordIdentityProvider, User
from traitlets import default

__all__ = [
    "DEFAULT_HOST",
    "DEFAULT_PORT",
    "NOTEBOOK",
    "MeetingPlan",
    "MeetingIdentityProvider",
    "build_command",
    "check_token",
    "clean_name",
    "exposure_warning",
    "is_loopback",
    "new_token",
    "password_file",
    "write_password",
    "main",
]

ROOT = Path(__file__).resolve().parents[1]
DEFAULT_HOST = "127.0.0.1"
DEFAULT_PORT = 8866
NOTEBOOK = ROOT / "notebooks" / "review_meeting.ipynb"
MIN_TOKEN_LENGTH = 16
"""Shortest token accepted [characters]; :func:`new_token` gives 32 (192 random bits)."""
MIN_PASSWORD_LENGTH = 8
NAME_MAX = 40
PROVIDER = "workbench.meeting.MeetingIdentityProvider"
_PASSWORD_ENV = "HEATPATH_MEETING_PASSWORD_FILE"
_TOKEN_ENV = "HEATPATH_MEETING_TOKEN"


# ---------------------------------------------------------------------------
# Host, token, password
# ---------------------------------------------------------------------------
def is_loopback(host: str) -> bool:
    """True when ``host`` is reachable only from this machine (127.0.0.0/8, ::1, localhost).

    Examples
    --------
    >>> is_loopback("127.0.0.1"), is_loopback("::1"), is_loopback("localhost")
    (True, True, True)
    >>> is_loopback("0.0.0.0"), is_loopback("192.168.1.20"), is_loopback("")
    (False, False, False)
    """
    h = (host or "").strip().strip("[]")
    if h.lower() == "localhost":
        return True
    try:
        return ipaddress.ip_address(h).is_loopback
    except ValueError:
        return False  # a host name: it may resolve to any interface


def exposure_warning(host: str) -> str | None:
    """The warning printed when the server listens beyond this machine (None on loopback)."""
    if is_loopback(host):
        return None
    where = "every network interface" if host in ("", "0.0.0.0", "::", "*") else f"address {host}"
    return (
        f"WARNING: the meeting server listens on {where}, not only on this machine. Anyone who "
        "has the link (with its token) or the password can run any code as this user on this "
        "machine. Use it only on a network you trust, and stop it (Ctrl+C) when the meeting ends."
    )


def new_token() -> str:
    """A fresh random token for one meeting (``secrets.token_urlsafe(24)``: 192 bits, 32 characters)."""
    return secrets.token_urlsafe(24)


def check_token(token: str | None) -> str:
    """Return ``token`` if it is usable; refuse an empty, short or unsafe one.

    Examples
    --------
    >>> check_token("")
    Traceback (most recent call last):
    ...
    ValueError: token: empty; the meeting never runs without a token or a password (leave HEATPATH_MEETING_TOKEN unset for a random one, or set a password with `make meeting-password`)
    """
    if token is None or not str(token).strip():
        raise ValueError(
            "token: empty; the meeting never runs without a token or a password (leave "
            f"{_TOKEN_ENV} unset for a random one, or set a password with `make meeting-password`)"
        )
    token = str(token)
    if len(token) < MIN_TOKEN_LENGTH:
        raise ValueError(f"token: {len(token)} characters is too short to guess-proof the link; "
                         f"use at least {MIN_TOKEN_LENGTH} (the random default has 32)")
    if not re.fullmatch(r"[A-Za-z0-9_\-.~]+", token):
        raise ValueError("token: use only letters, digits and - _ . ~ (it goes into the link)")
    return token


def password_file() -> Path:
    """Where ``make meeting-password`` keeps the password's hash: ``$HEATPATH_MEETING_PASSWORD_FILE``,
    else ``meeting-password.json`` in the per-user state folder (see :func:`workbench.scenario.state_dir`)."""
    env = os.environ.get(_PASSWORD_ENV)
    if env:
        return Path(env).expanduser()
    from workbench.scenario import state_dir

    return state_dir() / "meeting-password.json"


def read_password_hash(path: Path | None = None) -> str:
    """The stored password hash ("" when none is set)."""
    p = password_file() if path is None else Path(path)
    if not p.is_file():
        return ""
    try:
        data = json.loads(p.read_text("utf-8"))
    except (OSError, ValueError) as exc:
        raise ValueError(f"{p}: not a meeting password file ({exc}); set it again with "
                         "`make meeting-password`") from None
    value = data.get("hashed_password", "") if isinstance(data, dict) else ""
    if not isinstance(value, str) or not value.count(":") >= 1:
        raise ValueError(f"{p}: no password hash in it; set it again with `make meeting-password`")
    return value


def write_password(password: str, path: Path | None = None) -> Path:
    """Store the hash (argon2, jupyter_server's ``passwd``) of a meeting password, file mode 0600."""
    from jupyter_server.auth.security import passwd

    if len(password) < MIN_PASSWORD_LENGTH:
        raise ValueError(f"password: at least {MIN_PASSWORD_LENGTH} characters, please")
    p = password_file() if path is None else Path(path)
    p.parent.mkdir(parents=True, exist_ok=True)
    tmp = p.with_name(p.name + ".tmp")
    fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_TRUNC, 0o600)
    with os.fdopen(fd, "w", encoding="utf-8") as fh:
        json.dump({"hashed_password": passwd(password)}, fh)
    os.replace(tmp, p)
    return p


# ---------------------------------------------------------------------------
# The command line of the server
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class MeetingPlan:
    """What :func:`build_command` decided: the command, its environment and the link to share.

    ``env`` holds only the variables to add to the caller's environment (the
    token travels there, never in ``argv``). ``token`` is "" in password mode.
    """

    argv: list[str]
    env: dict[str, str]
    host: str
    port: int
    token: str
    password: bool
    url: str
    notebook_path: str
    warning: str | None = None
    notes: list[str] = field(default_factory=list)


def _link_host(host: str) -> str:
    """The host name to put into the shared link (a wildcard bind is not an address to visit)."""
    if host in ("", "0.0.0.0", "::", "*"):
        try:
            with socket.socket(socket.AF_INET, socket.SOCK_DGRAM) as s:
                s.connect(("192.0.2.1", 9))  # TEST-NET-1 (RFC 5737): no packet is sent
                return s.getsockname()[0]
        except OSError:
            return socket.gethostname()
    if ":" in host and not host.startswith("["):
        return f"[{host}]"
    return host


def build_command(
    notebook: str | os.PathLike = NOTEBOOK,
    host: str | None = None,
    port: int | str | None = None,
    token: str | None = None,
    password_hash: str | None = None,
    root_dir: str | os.PathLike | None = None,
    jupyter: str | None = None,
    allow_root: bool | None = None,
    extra: tuple[str, ...] | list[str] = (),
) -> MeetingPlan:
    """The JupyterLab command line, environment and shared link of a meeting.

    Parameters
    ----------
    notebook : path
        The review notebook; it must lie inside ``root_dir``.
    host : str, optional
        Address to listen on; default 127.0.0.1 (this machine only).
    port : int, optional
        TCP port, 1–65535; default :data:`DEFAULT_PORT`. No fallback to another
        port (``port_retries=0``), so the printed link is the one that works.
    token : str, optional
        The link's secret; default: a new random one. Refused when empty or short.
    password_hash : str, optional
        A stored password hash: password mode (no token; participants type the
        password). Default: none (token mode).
    root_dir : path, optional
        The folder JupyterLab serves; default: the project folder.
    jupyter : str, optional
        The ``jupyter`` executable; default: the one beside this Python.
    allow_root : bool, optional
        Pass ``--allow-root``; default: when running as root.
    extra : sequence of str
        More ``--Class.trait=value`` options (tests add ``--LabApp.expose_app_in_browser=True``).
    """
    host = DEFAULT_HOST if host is None or not str(host).strip() else str(host).strip()
    try:
        port_n = DEFAULT_PORT if port is None or str(port).strip() == "" else int(str(port).strip())
    except ValueError:
        raise ValueError(f"port: expected a whole number 1–65535, got {port!r}") from None
    if not 1 <= port_n <= 65535:
        raise ValueError(f"port: expected a whole number 1–65535, got {port_n}")
    root = Path(root_dir if root_dir is not None else ROOT).resolve()
    nb = Path(notebook).resolve()
    try:
        rel = nb.relative_to(root).as_posix()
    except ValueError:
        raise ValueError(f"notebook: {nb} is not inside the served folder {root}") from None
    if not nb.is_file():
        raise ValueError(f"notebook: {nb} does not exist")
    password = bool(password_hash)
    if password:
        token = ""
    else:
        token = check_token(new_token() if token is None else token)
    exe = jupyter or str(Path(sys.executable).parent / "jupyter")
    if allow_root is None:
        allow_root = hasattr(os, "geteuid") and os.geteuid() == 0
    argv = [
        exe, "lab", rel, "--no-browser",
        f"--ServerApp.ip={host}",
        f"--ServerApp.port={port_n}",
        "--ServerApp.port_retries=0",
        f"--ServerApp.root_dir={root}",
        f"--ServerApp.identity_provider_class={PROVIDER}",
        "--ServerApp.open_browser=False",
    ]
    if allow_root:
        argv.append("--allow-root")
    argv += list(extra)
    env = {"JUPYTER_TOKEN": token}
    if password:
        env[_PASSWORD_ENV] = str(password_file())
    link = f"http://{_link_host(host)}:{port_n}/lab/tree/{quote(rel)}"
    url = f"{link}?token={token}&name=YOUR_NAME" if token else f"{link}?name=YOUR_NAME"
    notes = []
    if password:
        notes.append("Password mode: participants open the link and type the meeting password.")
    return MeetingPlan(argv, env, host, port_n, token, password, url, rel, exposure_warning(host), notes)


# ---------------------------------------------------------------------------
# Who is who: a name per participant
# ---------------------------------------------------------------------------
def clean_name(text: str | None) -> str:
    """A participant's chosen name, made safe to show: printable, one line, at most 40 characters.

    Examples
    --------
    >>> clean_name("  Ada   Lovelace ")
    'Ada Lovelace'
    >>> clean_name("<b>Bo</b>\\x07"), clean_name("YOUR_NAME"), clean_name(None)
    ('bBo/b', '', '')
    """
    if not text:
        return ""
    text = unicodedata.normalize("NFC", str(text))
    text = "".join(ch for ch in text if unicodedata.category(ch)[0] != "C" and ch not in "<>&\"'`\\")
    text = " ".join(text.split())[:NAME_MAX].strip()
    return "" if text.upper() == "YOUR_NAME" else text


def _initials(name: str) -> str:
    words = [w for w in re.split(r"[\s._-]+", name) if w]
    return "".join(w[0] for w in words[:2]).upper() or name[:1].upper()


def _colour(name: str) -> str:
    """A stable, readable colour per name (hue from the name's hash)."""
    h = int(hashlib.sha256(name.encode("utf-8")).hexdigest()[:8], 16) / 0xFFFFFFFF
    r, g, b = colorsys.hls_to_rgb(h, 0.42, 0.65)
    return f"#{int(r * 255):02x}{int(g * 255):02x}{int(b * 255):02x}"


def requested_name(handler) -> str:
    """The ``name=`` of the request, or of its ``next=`` page (the password login form)."""
    try:
        name = handler.get_argument("name", "")
        if not name:
            nxt = handler.get_argument("next", "")
            if nxt:
                name = (parse_qs(urlparse(nxt).query).get("name") or [""])[0]
    except Exception:  # a handler without arguments (websocket upgrade, ...)
        return ""
    return clean_name(name)


def user_named(name: str) -> User:
    """The jupyter_server user shown for ``name`` (a fresh id: two people may share a name)."""
    slug = re.sub(r"[^a-z0-9]+", "-", name.lower()).strip("-") or "participant"
    return User(f"{slug}-{uuid.uuid4().hex[:8]}", name, name, _initials(name), None, _colour(name))


class MeetingIdentityProvider(PasswordIdentityProvider):
    """jupyter_server's password/token identity, with the participant's chosen name.

    - ``generate_anonymous_user`` (called by jupyter_server for a
      token-authenticated request without a login cookie, and after a
      password login) takes the name from the link's ``name=`` argument;
    - a later link with another ``name=`` renames the participant (the login
      cookie otherwise keeps the first name);
    - ``hashed_password`` defaults to the one stored by ``make meeting-password``
      when the launcher points ``$HEATPATH_MEETING_PASSWORD_FILE`` at it;
    - the server refuses to start when there is neither a token nor a password.
    """

    @default("hashed_password")
    def _meeting_password(self) -> str:
        path = os.environ.get(_PASSWORD_ENV)
        return read_password_hash(Path(path)) if path else ""

    def generate_anonymous_user(self, handler) -> User:
        name = requested_name(handler)
        if not name:
            return super().generate_anonymous_user(handler)
        return user_named(name)

    async def get_user_token(self, handler):
        user = await super().get_user_token(handler)
        name = requested_name(handler)
        if user is not None and name and user.display_name != name:
            user = user_named(name)
        return user

    def validate_security(self, app, ssl_options=None) -> None:
        super().validate_security(app, ssl_options)
        if not self.token and not self.hashed_password:
            self.log.critical("The review meeting never runs without a token or a password; "
                              "start it with `make meeting` (random token) or set a password "
                              "with `make meeting-password`.")
            sys.exit(1)


# ---------------------------------------------------------------------------
# Command line
# ---------------------------------------------------------------------------
def _password_command() -> int:
    first = getpass.getpass("Meeting password (at least 8 characters): ")
    second = getpass.getpass("Again: ")
    if first != second:
        print("heatpath meeting: the two entries differ; nothing changed", file=sys.stderr)
        return 2
    try:
        p = write_password(first)
    except ValueError as exc:
        print(f"heatpath meeting: {exc}", file=sys.stderr)
        return 2
    print(f"heatpath meeting: password hash stored in {p} (delete the file to go back to tokens)")
    return 0


def main(argv: list[str] | None = None) -> int:
    """``python -m workbench.meeting [--host H] [--port P] [--dry-run]`` or ``... password``."""
    ap = argparse.ArgumentParser(prog="python -m workbench.meeting",
                                 description="Start the shared review meeting (JupyterLab, real-time collaboration).")
    ap.add_argument("action", nargs="?", choices=("start", "password"), default="start")
    ap.add_argument("--host", default=os.environ.get("HOST") or None,
                    help=f"address to listen on (default {DEFAULT_HOST}: this machine only)")
    ap.add_argument("--port", default=os.environ.get("PORT") or None, help=f"TCP port (default {DEFAULT_PORT})")
    ap.add_argument("--notebook", default=str(NOTEBOOK), help="the review notebook")
    ap.add_argument("--dry-run", action="store_true", help="print the command and the link, start nothing")
    args = ap.parse_args(argv)
    if args.action == "password":
        return _password_command()
    try:
        import jupyter_server_ydoc  # noqa: F401  (the collaboration extension)
    except ImportError:
        print("heatpath meeting: jupyter-collaboration is not installed; run `make lab` (the lab "
              "extra installs it) or `pip install -e '.[lab]'`", file=sys.stderr)
        return 2
    try:
        pw = read_password_hash()
        token = os.environ.get(_TOKEN_ENV)
        plan = build_command(args.notebook, args.host, args.port, token=token, password_hash=pw or None)
    except ValueError as exc:
        print(f"heatpath meeting: {exc}", file=sys.stderr)
        return 2
    if plan.warning:
        print(plan.warning, file=sys.stderr, flush=True)
    print("Review meeting: share this link (each participant replaces YOUR_NAME with their name):")
    print(f"    {plan.url}")
    for note in plan.notes:
        print(note)
    print("Stop the meeting with Ctrl+C. The notebook autosaves; the kernel is shared by everyone.", flush=True)
    if args.dry_run:
        print("command:", " ".join(plan.argv))
        return 0
    env = {k: v for k, v in os.environ.items() if k != "JUPYTER_TOKEN_FILE"}
    env.update(plan.env)
    os.execve(plan.argv[0], plan.argv, env)
    return 0  # pragma: no cover


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
