"""The review-meeting launcher (``workbench.meeting``): command line, host warning, secrets, names.

The identity provider is exercised through real HTTP requests to a small
tornado application (jupyter_server's own request path: ``get_user`` →
token check → login cookie → ``generate_anonymous_user``); the whole server
with two browsers is tested in tests/test_browser_meeting.py.

Outside checks: loopback addresses are 127.0.0.0/8 and ::1 (RFC 1122
section 3.2.1.3; RFC 4291 section 2.5.3); stored password hashes are checked
with jupyter_server's own ``passwd_check``.
"""

from __future__ import annotations

import asyncio
import dataclasses
import json
import logging
import sys
from pathlib import Path
from urllib.parse import quote, urlencode

import pytest
import tornado.httpclient
import tornado.web
from jupyter_server.auth.security import passwd_check
from jupyter_server.serverapp import ServerApp
from tornado.httpserver import HTTPServer
from tornado.testing import bind_unused_port

from workbench import meeting
from workbench.meeting import (
    NOTEBOOK,
    MeetingIdentityProvider,
    build_command,
    check_token,
    clean_name,
    exposure_warning,
    is_loopback,
    read_password_hash,
    write_password,
)

ROOT = Path(__file__).resolve().parent.parent


@pytest.fixture()
def notebook(tmp_path):
    nb = tmp_path / "notebooks" / "review_meeting.ipynb"
    nb.parent.mkdir()
    nb.write_text("{}")
    return nb


# ------------------------------------------------------------------ command line
def test_default_command_listens_on_loopback_with_a_random_token(notebook, tmp_path):
    plan = build_command(notebook, root_dir=tmp_path, allow_root=False)
    argv = plan.argv
    assert argv[1:3] == ["lab", "notebooks/review_meeting.ipynb"]
    assert "--ServerApp.ip=127.0.0.1" in argv and plan.host == "127.0.0.1"
    assert f"--ServerApp.port={meeting.DEFAULT_PORT}" in argv
    assert "--ServerApp.port_retries=0" in argv  # the printed link is the port in use
    assert "--ServerApp.identity_provider_class=workbench.meeting.MeetingIdentityProvider" in argv
    assert f"--ServerApp.root_dir={tmp_path.resolve()}" in argv
    assert "--allow-root" not in argv
    # the token travels in the environment, not on the command line (others can read `ps`)
    assert len(plan.token) >= 32 and plan.env["JUPYTER_TOKEN"] == plan.token
    assert not any(plan.token in a for a in argv)
    assert plan.url == (f"http://127.0.0.1:{meeting.DEFAULT_PORT}/lab/tree/notebooks/review_meeting.ipynb"
                        f"?token={plan.token}&name=YOUR_NAME")
    assert plan.warning is None
    assert build_command(notebook, root_dir=tmp_path).token != plan.token  # new each meeting


def test_host_port_root_and_extra_options(notebook, tmp_path):
    plan = build_command(notebook, host="127.0.0.2", port="9123", token="t" * 20, root_dir=tmp_path,
                         allow_root=True, extra=["--LabApp.expose_app_in_browser=True"])
    assert "--ServerApp.ip=127.0.0.2" in plan.argv and "--ServerApp.port=9123" in plan.argv
    assert "--allow-root" in plan.argv and plan.argv[-1] == "--LabApp.expose_app_in_browser=True"
    assert plan.url.startswith("http://127.0.0.2:9123/lab/tree/")
    assert plan.warning is None  # 127.0.0.0/8 is all loopback (RFC 1122 3.2.1.3)


@pytest.mark.parametrize("host", ["0.0.0.0", "192.168.10.7", "::", "meeting-room.example"])
def test_other_addresses_print_the_plain_warning(notebook, tmp_path, host):
    plan = build_command(notebook, host=host, root_dir=tmp_path)
    assert plan.warning is not None
    for words in ("Anyone who has the link", "run any code as this user on this machine",
                  "network you trust"):
        assert words in plan.warning
    if host in ("0.0.0.0", "::"):
        assert "every network interface" in plan.warning
        assert f"//{host}:" not in plan.url  # a wildcard is not an address to share


@pytest.mark.parametrize("host, loop", [("127.0.0.1", True), ("127.8.9.10", True), ("::1", True),
                                        ("[::1]", True), ("localhost", True), ("0.0.0.0", False),
                                        ("10.0.0.1", False), ("", False), ("example.org", False)])
def test_is_loopback(host, loop):
    assert is_loopback(host) is loop
    assert (exposure_warning(host) is None) is loop


@pytest.mark.parametrize("token, why", [("", "empty"), ("   ", "empty"), (None, "empty"),
                                        ("short", "too short"), ("x" * 20 + "&a=b", "only letters")])
def test_refuses_an_empty_or_weak_token(notebook, tmp_path, token, why):
    if token is None:
        with pytest.raises(ValueError, match=why):
            check_token(token)
        return
    with pytest.raises(ValueError, match=why):
        build_command(notebook, token=token, root_dir=tmp_path)


def test_refuses_bad_port_and_a_notebook_outside_the_folder(notebook, tmp_path):
    for port in ("0", "70000", "eighty"):
        with pytest.raises(ValueError, match="port: expected a whole number"):
            build_command(notebook, port=port, root_dir=tmp_path)
    with pytest.raises(ValueError, match="not inside the served folder"):
        build_command(notebook, root_dir=tmp_path / "notebooks" / "elsewhere")
    with pytest.raises(ValueError, match="does not exist"):
        build_command(tmp_path / "missing.ipynb", root_dir=tmp_path)


def test_password_mode_has_no_token_and_stores_only_a_hash(notebook, tmp_path, monkeypatch):
    store = tmp_path / "state" / "meeting-password.json"
    monkeypatch.setenv("HEATPATH_MEETING_PASSWORD_FILE", str(store))
    with pytest.raises(ValueError, match="at least 8"):
        write_password("short")
    write_password("correct horse battery")
    assert (store.stat().st_mode & 0o777) == 0o600
    assert "correct horse" not in store.read_text()
    hashed = read_password_hash()
    assert passwd_check(hashed, "correct horse battery") and not passwd_check(hashed, "wrong one!")
    plan = build_command(notebook, password_hash=hashed, root_dir=tmp_path)
    assert plan.password and plan.token == "" and plan.env["JUPYTER_TOKEN"] == ""
    assert plan.env["HEATPATH_MEETING_PASSWORD_FILE"] == str(store)
    assert "token=" not in plan.url and plan.url.endswith("?name=YOUR_NAME")


def test_main_dry_run_prints_the_link_and_refuses_an_empty_token(monkeypatch, capsys, tmp_path):
    monkeypatch.setenv("HEATPATH_MEETING_PASSWORD_FILE", str(tmp_path / "none.json"))
    monkeypatch.delenv("HEATPATH_MEETING_TOKEN", raising=False)
    if not NOTEBOOK.is_file():
        pytest.skip("notebooks/review_meeting.ipynb not present")
    assert meeting.main(["--dry-run", "--host", "0.0.0.0", "--port", "9001"]) == 0
    out, err = capsys.readouterr()
    assert "share this link" in out and ":9001/lab/tree/notebooks/review_meeting.ipynb?token=" in out
    assert "run any code as this user" in err
    monkeypatch.setenv("HEATPATH_MEETING_TOKEN", "")
    assert meeting.main(["--dry-run"]) == 2
    assert "never runs without a token or a password" in capsys.readouterr().err


# ------------------------------------------------------------------ names
@pytest.mark.parametrize("raw, shown", [("Ada", "Ada"), ("  Bo   Chen ", "Bo Chen"),
                                        ("<img src=x>", "img src=x"), ("YOUR_NAME", ""),
                                        ("x" * 60, "x" * 40), ("Zoë\u200b", "Zoë")])
def test_clean_name(raw, shown):
    assert clean_name(raw) == shown


class _WhoAmI(tornado.web.RequestHandler):
    """A minimal handler with what jupyter_server's identity code reads (token, base_url, log)."""

    base_url = "/"
    log = logging.getLogger("test_meeting")

    @property
    def token(self):
        return self.settings["provider"].token

    async def get(self):
        user = await self.settings["provider"].get_user(self)
        if user is None:
            self.set_status(403)
            self.finish({})
            return
        self.finish(dataclasses.asdict(user))

    async def post(self):  # the password login form
        user = self.settings["provider"].process_login_form(self)
        if user is None:
            self.set_status(403)
            self.finish({})
            return
        self.finish(dataclasses.asdict(user))


def _ask(provider, paths: list[tuple]) -> list[tuple[int, dict]]:
    """GET each ``(path, send_cookies)`` in turn on a real tornado server (POST for
    ``(path, send_cookies, form_body)``); cookies are collected as a browser would."""

    async def run():
        sock, port = bind_unused_port()
        app = tornado.web.Application([(r"/.*", _WhoAmI)], provider=provider, cookie_secret="s" * 32)
        server = HTTPServer(app)
        server.add_sockets([sock])
        client = tornado.httpclient.AsyncHTTPClient()
        cookies: dict[str, str] = {}
        out = []
        try:
            for path, with_cookie, *body in paths:
                headers = {"Cookie": "; ".join(f"{k}={v}" for k, v in cookies.items())} if with_cookie and cookies else {}
                kw = {"method": "POST", "body": urlencode(body[0])} if body else {}
                r = await client.fetch(f"http://127.0.0.1:{port}{path}", headers=headers, raise_error=False, **kw)
                for c in r.headers.get_list("Set-Cookie"):
                    k, v = c.split(";", 1)[0].split("=", 1)
                    cookies[k] = v
                out.append((r.code, json.loads(r.body or b"{}")))
        finally:
            server.stop()
            client.close()
        return out

    return asyncio.run(run())


TOKEN = "meeting-test-token-0123456789"


def test_identity_takes_the_name_from_the_link():
    p = MeetingIdentityProvider(token=TOKEN)
    (code, ada), (code2, anon), (code3, _) = _ask(p, [
        (f"/lab?token={TOKEN}&name=Ada%20Lovelace", False),
        (f"/lab?token={TOKEN}", False),
        ("/lab?token=wrong-token-wrong-token&name=Eve", False),
    ])
    assert code == 200 and ada["display_name"] == ada["name"] == "Ada Lovelace"
    assert ada["initials"] == "AL" and ada["color"].startswith("#") and len(ada["color"]) == 7
    assert ada["username"].startswith("ada-lovelace-")
    assert code2 == 200 and anon["display_name"].startswith("Anonymous ")  # jupyter_server default
    assert code3 == 403


def test_identity_kept_by_cookie_and_renamed_by_a_new_link():
    p = MeetingIdentityProvider(token=TOKEN)
    (_, first), (c2, again), (_, renamed) = _ask(p, [
        (f"/lab?token={TOKEN}&name=Ada", False),
        ("/api/me", True),  # no token: the login cookie identifies the same participant
        (f"/lab?token={TOKEN}&name=Bea", True),
    ])
    assert c2 == 200 and again["username"] == first["username"] and again["display_name"] == "Ada"
    assert renamed["display_name"] == "Bea" and renamed["username"] != first["username"]


def test_two_participants_with_one_name_stay_apart():
    p = MeetingIdentityProvider(token=TOKEN)
    (_, a), (_, b) = _ask(p, [(f"/?token={TOKEN}&name=Sam", False), (f"/?token={TOKEN}&name=Sam", False)])
    assert a["display_name"] == b["display_name"] == "Sam" and a["username"] != b["username"]


def test_name_from_the_login_form_next_page(tmp_path, monkeypatch):
    """Password mode: the login form posts ``next=/lab/tree/...?name=...``."""
    store = tmp_path / "pw.json"
    monkeypatch.setenv("HEATPATH_MEETING_PASSWORD_FILE", str(store))
    write_password("meeting password 1")
    p = MeetingIdentityProvider(token="")
    assert p.hashed_password and p.auth_enabled and not p.token
    nxt = "/lab/tree/notebooks/review_meeting.ipynb?name=Chair%20Kim"
    (code, user), (bad, _) = _ask(p, [(f"/login?next={quote(nxt)}", False, {"password": "meeting password 1"}),
                                      ("/login", False, {"password": "not it at all"})])
    assert code == 200 and user["display_name"] == "Chair Kim"
    assert bad == 403


def test_server_refuses_to_run_without_token_or_password(monkeypatch, caplog):
    monkeypatch.delenv("HEATPATH_MEETING_PASSWORD_FILE", raising=False)
    app = ServerApp(ip="127.0.0.1")
    with pytest.raises(SystemExit):
        MeetingIdentityProvider(token="").validate_security(app)
    assert "never runs without a token or a password" in caplog.text
    MeetingIdentityProvider(token=TOKEN).validate_security(app)  # with a token: fine


def test_module_runs_as_a_script():
    import subprocess

    r = subprocess.run([sys.executable, "-m", "workbench.meeting", "--help"], capture_output=True, text=True,
                       cwd=ROOT, timeout=60)
    assert r.returncode == 0 and "--host" in r.stdout and "password" in r.stdout
