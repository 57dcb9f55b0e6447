"""Reading project files fast: the compiled TOML parser gives what the standard library gives, and a
portfolio's files are listed once however they are named."""

from __future__ import annotations

import os
import tomllib

import pytest
from helpers import DEMO, PORTFOLIO, ROOT

from carbonledger.analyses.portfolio import project_files
from carbonledger.errors import InputError
from carbonledger.model.project import loads_toml

TOML_FILES = sorted([*DEMO.glob("*.toml"), *PORTFOLIO.glob("*.toml"), *(ROOT / "demo_projects").rglob("*.toml")])


@pytest.mark.parametrize("path", TOML_FILES, ids=lambda p: p.name)
def test_every_demo_file_reads_as_the_standard_library_reads_it(path):
    # Reference: Python's tomllib (TOML 1.0.0), which the tool used before; rtoml must give the same values.
    text = path.read_text(encoding="utf-8")
    assert loads_toml(text, path) == tomllib.loads(text)


def test_there_are_demo_files_to_compare():
    assert len(TOML_FILES) >= 10


@pytest.mark.parametrize(
    ("text", "where"),
    [
        ("a = 1\na = 2", "Cannot overwrite a value"),  # a key defined twice (TOML 1.0.0, "Keys")
        ('a = "\\q"', "line 1"),  # an escape TOML does not define (TOML 1.0.0, "String")
        ("[t]\nb = 1\n[t]", "line 3"),  # a table defined twice (TOML 1.0.0, "Table")
    ],
)
def test_bad_toml_is_one_line_with_the_standard_librarys_words(text, where):
    with pytest.raises(InputError) as error:
        loads_toml(text, "p.toml")
    message = str(error.value)
    assert "p.toml" in message and "valid TOML" in message and where in message


def test_an_integer_beyond_64_bits_is_read_exactly():
    # TOML 1.0.0 requires 64-bit integers and allows more; tomllib reads any size exactly.
    assert loads_toml("a = 123456789012345678901234567890", "p.toml") == {"a": 123456789012345678901234567890}


def test_a_file_named_through_its_folder_a_link_and_itself_is_listed_once(tmp_path):
    (tmp_path / "a.toml").write_text("", encoding="utf-8")
    (tmp_path / "b.toml").write_text("", encoding="utf-8")
    (tmp_path / "notes.txt").write_text("", encoding="utf-8")
    os.symlink(tmp_path / "a.toml", tmp_path / "c.toml")
    (tmp_path / "sub").mkdir()
    found = project_files([tmp_path, tmp_path / "b.toml", tmp_path / "sub" / ".." / "a.toml"])
    assert [path.name for path in found] == ["a.toml", "b.toml"]


def test_a_file_is_read_whole_at_its_size_and_refused_beyond_the_limit(tmp_path, monkeypatch):
    """read_input_bytes reads the size the file had when checked; a file that grew since (simulated by
    checking it smaller) is still read whole, and one that grew past the limit is refused in one line."""
    from carbonledger.errors import InputError
    from carbonledger.model import input_files

    path = tmp_path / "project.toml"
    path.write_bytes(b"x" * 1000)
    assert input_files.read_input_bytes(path, "project file") == b"x" * 1000
    real = input_files._checked
    monkeypatch.setattr(input_files, "_checked", lambda p, what, limit: (real(p, what, limit)[0], 10))
    assert input_files.read_input_bytes(path, "project file") == b"x" * 1000  # grew after the check: all of it
    with pytest.raises(InputError, match="at most"):
        input_files.read_input_bytes(path, "project file", limit=500)
    monkeypatch.undo()
    with pytest.raises(InputError, match="at most 0 MiB"):
        input_files.read_input_bytes(path, "project file", limit=999)
