"""``shaftwright users``: the accounts of a team's server, kept in the store.

- ``users add NAME``: a new account; the password is asked for twice at a terminal, or read
  as the first line of standard input (``printf '%s\\n' "$PW" | shaftwright users add ann``).
- ``users list``: the accounts, when each was made and how many API tokens it has.
- ``users remove NAME``: the account goes, with its tokens and sessions (its revisions keep
  its name as their author).
- ``users token NAME [--label TEXT]``: a new API token for scripts
  (``Authorization: Bearer TOKEN``), printed once: only its hash is kept.
- ``users password NAME``: a new password (asked for as in ``add``); the account's
  browser sessions end.

The store is the one the server uses (``SHAFTWRIGHT_DB``, see :mod:`app.settings`). Once one
account exists, the server asks everyone to sign in (see :mod:`app.auth`).
"""
from __future__ import annotations

import argparse
import getpass
import sys

__all__ = ["add_parser", "cmd_users"]


def add_parser(sub) -> None:
    """Add ``users`` and its subcommands to the ``shaftwright`` command's subparsers."""
    p = sub.add_parser("users", help="the accounts that may use a shared server (add, list, "
                                     "remove, token, password)",
                       description=__doc__.split("\n\n")[0])
    actions = p.add_subparsers(dest="users_command", required=True)
    a = actions.add_parser("add", help="add an account (password from a prompt or stdin)")
    a.add_argument("name")
    actions.add_parser("list", help="list the accounts")
    a = actions.add_parser("remove", help="remove an account with its tokens and sessions")
    a.add_argument("name")
    a = actions.add_parser("token", help="make an API token for an account (printed once)")
    a.add_argument("name")
    a.add_argument("--label", default="", help="what the token is for (shown in 'users list')")
    a = actions.add_parser("password", help="set a new password for an account")
    a.add_argument("name")
    p.set_defaults(func=cmd_users)


def _store():
    from app.settings import Settings
    from app.store import open_store

    return open_store(Settings.from_env().db)


def _read_password(name: str) -> str:
    from app.auth import MIN_PASSWORD

    if sys.stdin.isatty():
        first = getpass.getpass(f"password for {name}: ")
        if getpass.getpass("the same again: ") != first:
            raise SystemExit("shaftwright users: the two passwords differ; nothing was changed")
    else:
        first = sys.stdin.readline().rstrip("\r\n")
    if len(first) < MIN_PASSWORD:
        raise SystemExit(f"shaftwright users: a password needs at least {MIN_PASSWORD} characters; "
                         "nothing was changed")
    if len(first) > 1024:
        raise SystemExit("shaftwright users: a password may have at most 1024 characters")
    return first


def cmd_users(args: argparse.Namespace) -> int:
    from app import auth
    from app.store import AccountExists, NotFound, StoreError

    name = getattr(args, "name", "")
    if args.users_command != "list" and not auth.valid_name(name):
        raise SystemExit(f"shaftwright users: {name!r} is not an account name (1 to 64 letters, "
                         "digits, '.', '_', '@' or '-', starting with a letter or digit)")
    try:
        store = _store()
        if args.users_command == "add":
            store.add_account(name, auth.hash_password(_read_password(name)))
            print(f"account {name} added; the server now asks everyone to sign in")
        elif args.users_command == "password":
            if store.password_hash(name) is None:
                raise NotFound(f"no account {name!r}")
            store.set_password_hash(name, auth.hash_password(_read_password(name)))
            print(f"new password set for {name}")
        elif args.users_command == "list":
            rows = store.accounts()
            if not rows:
                print("no accounts: the server is open to everyone who reaches it (loopback only)")
            for a in rows:
                print(f"{a.name}\tsince {a.created_at[:16].replace('T', ' ')} UTC\t"
                      f"{a.tokens} API token{'s' if a.tokens != 1 else ''}")
        elif args.users_command == "remove":
            store.remove_account(name)
            print(f"account {name} removed, with its tokens and sessions")
        elif args.users_command == "token":
            token, token_id, hashed = auth.new_api_token()
            store.add_token(name, token_id, hashed, label=args.label)
            print(token)
            print(f"API token for {name}: shown only now; send it as "
                  "'Authorization: Bearer TOKEN'", file=sys.stderr)
    except AccountExists as exc:
        raise SystemExit(f"shaftwright users: {exc}") from None
    except NotFound as exc:
        raise SystemExit(f"shaftwright users: {exc}") from None
    except StoreError as exc:
        raise SystemExit(f"shaftwright users: the store cannot be used: {exc}") from None
    return 0
