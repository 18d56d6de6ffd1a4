"""Write assets/index.html: the web client's own page from flet-web, with our name and description,
and our script asking phones for the decimal keypad on number fields (assets/decimal-keys.js).

Flet serves an index.html found in the assets folder instead of its own (and patches both alike), so
the browser tab and the home-screen name say Boardside before the first frame paints. The page also
loads assets/guard.js first, which keeps the client from asking a public CDN for its animation runtime
(the script is pointed at assets/rive-unavailable.js). Run
`python tests/make_index.py` after upgrading flet-web; `tests/test_state_assets.py` fails until then.
"""

from __future__ import annotations

import re
from pathlib import Path

import flet_web

NAME = "Boardside"
DESCRIPTION = "Walk each circuit from measured Zs to a verdict, with the working shown."
DECIMAL_KEYS = '<script src="decimal-keys.js"></script>'


def flet_web_index() -> str:
    """The index.html shipped by the installed flet-web."""
    return (Path(flet_web.__file__).parent / "web" / "index.html").read_text(encoding="utf-8")


def patched_index(text: str) -> str:
    """flet-web's index.html with our title, description and home-screen name, loading guard.js first
    and decimal-keys.js before the client starts."""
    text = re.sub(r"(<base [^>]*>\n)", r'\1  <script src="guard.js"></script>\n', text, count=1)
    text = re.sub(r"<title>.*?</title>", f"<title>{NAME}</title>", text)
    text = text.replace('<script src="flutter_bootstrap.js"',
                        f'{DECIMAL_KEYS}\n  <script src="flutter_bootstrap.js"', 1)
    text = re.sub(r'(<meta name="description" content=")[^"]*(">)', rf"\g<1>{DESCRIPTION}\g<2>", text)
    return re.sub(r'(<meta name="apple-mobile-web-app-title" content=")[^"]*(">)', rf"\g<1>{NAME}\g<2>", text)


def main() -> None:
    target = Path(__file__).resolve().parents[1] / "assets" / "index.html"
    target.write_text(patched_index(flet_web_index()), encoding="utf-8")


if __name__ == "__main__":
    main()
