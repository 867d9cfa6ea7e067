"""The generated reference pages in docs/ are in step with the code (scripts/make_docs.py),
and the README links only inside the repository (a user who clones it has the reference)."""

from __future__ import annotations

import re
import subprocess
import sys

from conftest import ROOT


def test_generated_pages_are_current():
    done = subprocess.run([sys.executable, str(ROOT / "scripts" / "make_docs.py"), "--check"],
                          capture_output=True, text=True, check=False)
    assert done.returncode == 0, done.stdout + done.stderr


def test_readme_links_stay_inside_the_repository():
    text = (ROOT / "README.md").read_text()
    links = re.findall(r"\]\(([^)]+)\)", text)
    assert links, "the README links the docs"
    for link in links:
        assert not link.startswith(("http:", "https:", "..")), link
        assert (ROOT / link.split("#")[0]).exists(), link
    assert "../shared" not in text
