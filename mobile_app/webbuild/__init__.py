"""The static browser build of Boardside (`python -m mobile_app build-web OUT`); no Flet import here.

    build_site(out, spec=None, cache=None) -> Site   # the folder any static host can serve
    boardside_spec() -> AppSpec                      # what Boardside's site holds
    cli_build_web(out, cache=None) -> exit code
    BuildError (OutputExistsError, ClientError, DependencyError)

`client` picks the web client's files, `archive` packs and compiles the Python archives, `wheels`
fetches browser wheels into a cache; `site/` holds the page, its scripts and the service worker.
"""

from mobile_app.webbuild.build import AppSpec, Group, Site, boardside_spec, build_site, cli_build_web
from mobile_app.webbuild.errors import BuildError, ClientError, DependencyError, OutputExistsError

__all__ = [
    "AppSpec",
    "BuildError",
    "ClientError",
    "DependencyError",
    "Group",
    "OutputExistsError",
    "Site",
    "boardside_spec",
    "build_site",
    "cli_build_web",
]
