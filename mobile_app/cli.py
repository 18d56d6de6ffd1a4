"""Command line of the field app.

`python -m mobile_app [--port P] [--data DIR] [--demo]` serves the app in web mode on 127.0.0.1.
Subcommands: `demo`, `export`, `sync`, `package`, `build-web`, `office init|enrol`, `verify`. Each
subcommand's work lives in its own module; this file only parses arguments and turns typed errors into
one-line messages (exit 2).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path


class _Parser(argparse.ArgumentParser):
    """An argument parser whose usage errors are one line on stderr and exit 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        print(f"{self.prog}: {message}", file=sys.stderr)
        raise SystemExit(2)


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="python -m mobile_app", description=__doc__.splitlines()[0])
    parser.add_argument("--data", type=Path, default=None, help="folder of the job store")
    parser.add_argument("--port", type=int, default=8550, help="port on 127.0.0.1 (default 8550)")
    parser.add_argument("--demo", action="store_true", help="create the demo job if the store has none")
    sub = parser.add_subparsers(dest="command", parser_class=_Parser)

    demo = sub.add_parser("demo", help="create the demo job and print its id")
    demo.add_argument("--data", type=Path, default=None, dest="sub_data")

    export = sub.add_parser("export", help="write a job's JSON, CSV and PDF")
    export.add_argument("job_id", type=int)
    export.add_argument("--data", type=Path, default=None, dest="sub_data")
    export.add_argument("--out", type=Path, required=True)

    package = sub.add_parser("package", help="lay out a folder for `flet build apk|ipa|web`")
    package.add_argument("out", type=Path)

    web = sub.add_parser("build-web", help="write the static, offline browser build into a folder")
    web.add_argument("out", type=Path)
    web.add_argument("--cache", type=Path, default=None,
                     help="folder for downloaded browser wheels (default: the user's cache folder)")

    sync = sub.add_parser("sync", help="send what waits in the outbox to the office folder")
    sync.add_argument("--data", type=Path, default=None, dest="sub_data")

    office = sub.add_parser("office", help="the firm's key and enrolled supervisors")
    office_sub = office.add_subparsers(dest="office_command", required=True, parser_class=_Parser)
    init = office_sub.add_parser("init", help="make the firm's signing key in an office folder")
    init.add_argument("--dir", type=Path, required=True, dest="office_dir")
    enrol = office_sub.add_parser("enrol", help="enrol a supervisor: key pair, sealed key, roster entry")
    enrol.add_argument("name")
    enrol.add_argument("--dir", type=Path, required=True, dest="office_dir")
    enrol.add_argument("--passphrase-file", type=Path, required=True)
    enrol.add_argument("--days", type=int, default=365, help="days the enrolment is valid (default 365)")

    verify = sub.add_parser("verify", help="check a bundle's approval against the office folder")
    verify.add_argument("bundle", type=Path)
    verify.add_argument("--office", type=Path, required=True)
    return parser


def main(argv: list[str] | None = None) -> int:
    args = build_parser().parse_args(argv)
    data_dir = getattr(args, "sub_data", None) or args.data
    if args.command == "demo":
        from mobile_app.store.demo import cli_demo

        return cli_demo(data_dir)
    if args.command == "export":
        from mobile_app.export.cli import cli_export

        return cli_export(args.job_id, data_dir, args.out)
    if args.command == "package":
        from mobile_app.packaging import cli_package

        return cli_package(args.out)
    if args.command == "build-web":
        from mobile_app.webbuild import cli_build_web

        return cli_build_web(args.out, args.cache)
    if args.command == "sync":
        from mobile_app.sync.cli import cli_sync

        return cli_sync(data_dir)
    if args.command == "office":
        from mobile_app.office.cli import cli_office_enrol, cli_office_init

        if args.office_command == "init":
            return cli_office_init(args.office_dir)
        return cli_office_enrol(args.name, args.office_dir, args.passphrase_file, args.days)
    if args.command == "verify":
        from mobile_app.office.cli import cli_verify

        return cli_verify(args.bundle, args.office)
    from mobile_app.main import serve

    return serve(port=args.port, data_dir=data_dir, demo=args.demo)
