"""The browser build's export archive carries only the fontTools modules of export-modules.toml: a PDF is
written with every other fontTools module unimportable, and no listed module goes missing.

The export runs in a separate Python with fontTools' compiled speed-ups unavailable, as in the browser
(the archive has their Python versions only), and with an import hook that refuses, and records, every
fontTools module that the list leaves out; optional imports that fontTools would quietly do without are
caught that way too.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

from mobile_app.webbuild.archive import export_modules

ROOT = Path(__file__).resolve().parents[1]

EXPORT_WITH_KEPT_MODULES = """
import importlib.util, json, sys, tempfile
from importlib.machinery import ExtensionFileLoader, PathFinder
from pathlib import Path

kept = frozenset(json.loads(sys.argv[1]))
refused = []

class AsInTheBrowser:
    '''fontTools as the export archive has it: listed modules only, from their Python sources.'''

    def find_spec(self, name, path=None, target=None):
        if name != "fontTools" and not name.startswith("fontTools."):
            return None
        if name not in kept:
            refused.append(name)
            raise ImportError(f"{name} is not in the export archive")
        spec = PathFinder.find_spec(name, path)
        if spec is not None and isinstance(spec.loader, ExtensionFileLoader):
            source = Path(spec.origin).with_name(name.rpartition(".")[2] + ".py")
            return importlib.util.spec_from_file_location(name, source)
        return spec

sys.meta_path.insert(0, AsInTheBrowser())
from mobile_app.export import export_bundle
from mobile_app.export.pdf_layout import FONT, JobPdf
from mobile_app.state.jobs import demo_if_empty
from mobile_app.store import Store
from fontTools.ttLib import TTFont

folder = Path(tempfile.mkdtemp())
store = Store.open(folder)
demo_if_empty(store)
bundle = export_bundle(store, store.jobs.all()[0]["id"], folder / "out")
pdfs = [p for p in Path(bundle.path).iterdir() if p.suffix == ".pdf"]

# a page of every character both fonts have from Latin-1 to Greek, and common symbols, regular and bold
fonts = Path("mobile_app/fonts")
wanted = [*range(0x20, 0x7F), *range(0xA0, 0x250), *range(0x370, 0x400), *range(0x2190, 0x2200)]
pdf = JobPdf("characters", "a page of varied characters")
pdf.add_page()
for style, file in (("", "DejaVuSans.ttf"), ("B", "DejaVuSans-Bold.ttf")):
    cmap = TTFont(fonts / file)["cmap"].getBestCmap()
    pdf.set_font(FONT, style, 9)
    pdf.multi_cell(0, 5, "".join(chr(c) for c in wanted if c in cmap), new_x="LMARGIN", new_y="NEXT")
pdf.output(str(folder / "characters.pdf"))

imported = sorted(n for n in sys.modules if n == "fontTools" or n.startswith("fontTools."))
print(json.dumps({"pdfs": len(pdfs), "imported": imported, "refused": sorted(set(refused))}))
"""


def test_a_pdf_is_written_with_only_the_kept_fonttools_modules(tmp_path: Path) -> None:
    kept = export_modules()
    done = subprocess.run([sys.executable, "-c", EXPORT_WITH_KEPT_MODULES, json.dumps(sorted(kept))],
                          capture_output=True, text=True, timeout=300, cwd=ROOT)
    assert done.returncode == 0, done.stderr[-2000:]
    found = json.loads(done.stdout.strip().splitlines()[-1])
    assert found["pdfs"] == 1
    assert found["refused"] == [], f"add to mobile_app/webbuild/export-modules.toml: {found['refused']}"
    # the list holds nothing the export does not import (it was made from this export)
    assert sorted(kept) == found["imported"]

