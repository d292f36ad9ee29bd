"""Hostile configs: every malformed study gets one line, exit code 2, no traceback, nothing written.

The corpus lives in tests/hostile_configs/ (one file per fault, named by what is wrong;
its '# expect:' lines hold words the message must contain; make_corpus.py there writes
it). Cases that cannot be files in git (unreadable, 50 MB, a folder, a pipe, missing)
are made in tmp_path. Most cases call cli.main in-process; a sample runs the real
command line in a subprocess to prove there is no traceback end to end.
"""
from __future__ import annotations

import os
from pathlib import Path

import pytest

from flamecharts import cli, config as study_module

CORPUS = Path(__file__).resolve().parent / "hostile_configs"
FILES = sorted(CORPUS.glob("*.toml"))
PREFIX = "flamecharts: error: "


def expected_words(path: Path) -> list[str]:
    return [line[len(b"# expect: "):].decode("utf-8") for line in path.read_bytes().splitlines()
            if line.startswith(b"# expect: ")]


def assert_one_line_error(rc: int, out: str, err: str, words=()) -> str:
    assert rc == 2, err
    assert out == "", out
    assert err.startswith(PREFIX) and err.endswith("\n") and err.count("\n") == 1, repr(err)
    assert "Traceback" not in err
    for w in words:
        assert w in err, f"{w!r} not in {err!r}"
    return err


def call_main(capsys, *argv) -> tuple[int, str, str]:
    rc = cli.main([str(a) for a in argv])
    captured = capsys.readouterr()
    return rc, captured.out, captured.err


def test_the_corpus_is_complete():
    assert len(FILES) >= 40
    names = {f.stem for f in FILES}
    for required in ("unknown_top_key", "phi_nan", "pressure_negative", "pressure_inf", "temperature_zero",
                     "empty_phi_list", "ten_million_points", "duplicate_fuel_name", "unknown_species",
                     "no_positive_entry", "negative_mole_fraction", "mechanism_is_directory", "non_utf8",
                     "deeply_nested", "step_zero_range", "from_greater_than_to", "blend_fraction_above_one",
                     "blend_with_unknown_fuel", "string_where_number", "boolean_where_number", "huge_exponent"):
        assert required in names
    assert sum(n.startswith("wrong_type_") for n in names) >= 5
    for f in FILES:
        assert expected_words(f), f"{f.name} has no '# expect:' line"


@pytest.mark.parametrize("path", FILES, ids=[f.stem for f in FILES])
def test_check_refuses_in_one_line(path, tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    out_dir = tmp_path / "out"
    rc, out, err = call_main(capsys, "check", path, "--out", out_dir)
    assert_one_line_error(rc, out, err, expected_words(path))
    assert list(tmp_path.iterdir()) == []  # nothing written, not even output/


@pytest.mark.parametrize("path", FILES, ids=[f.stem for f in FILES])
def test_run_refuses_in_one_line_and_writes_nothing(path, tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    rc, out, err = call_main(capsys, "run", path, "--out", tmp_path / "out", "--jobs", "1", "--quiet")
    assert_one_line_error(rc, out, err, expected_words(path))
    assert list(tmp_path.iterdir()) == []


SUBPROCESS_SAMPLE = ["deeply_nested", "non_utf8", "huge_integer", "range_overflows_a_float", "unknown_species",
                     "species_name_with_newline", "mechanism_not_a_mechanism"]


@pytest.mark.parametrize("name", SUBPROCESS_SAMPLE)
def test_real_command_line_has_no_traceback(name, tmp_path, cli):
    path = CORPUS / f"{name}.toml"
    r = cli("run", path, "--out", tmp_path / "out", "--jobs", "1", cwd=tmp_path)
    assert_one_line_error(r.returncode, r.stdout, r.stderr, expected_words(path))
    assert not (tmp_path / "out").exists()


# ------------------------------------------------ cases that cannot be files in git

def test_a_50_mb_config_is_refused_by_its_size_without_being_read(tmp_path, capsys, monkeypatch):
    big = tmp_path / "big.toml"
    with open(big, "wb") as fh:  # sparse: 50 MB long, no disk used
        fh.truncate(50 * 1024 * 1024)

    def no_open(*a, **k):
        raise AssertionError("the config was opened although its size alone refuses it")

    monkeypatch.setattr(study_module, "open", no_open, raising=False)
    rc, out, err = call_main(capsys, "check", big, "--out", tmp_path / "out")
    assert_one_line_error(rc, out, err, ["big.toml", "52.4 MB", "larger than 1000 kB"])
    assert not (tmp_path / "out").exists()


def test_a_config_that_is_a_folder(tmp_path, capsys):
    (tmp_path / "study.toml").mkdir()
    rc, out, err = call_main(capsys, "run", tmp_path / "study.toml", "--out", tmp_path / "out")
    assert_one_line_error(rc, out, err, ["study.toml", "is a folder", "give a .toml file"])
    assert not (tmp_path / "out").exists()


def test_a_missing_config(tmp_path, capsys):
    rc, out, err = call_main(capsys, "check", tmp_path / "nowhere.toml")
    assert_one_line_error(rc, out, err, ["nowhere.toml", "not found"])


def test_a_pipe_or_device_as_config_is_refused_not_read(tmp_path, capsys):
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)  # reading it would block for ever
    rc, out, err = call_main(capsys, "check", fifo)
    assert_one_line_error(rc, out, err, ["pipe.toml", "not a regular file"])
    rc, out, err = call_main(capsys, "check", "/dev/zero")  # reading it would never end
    assert_one_line_error(rc, out, err, ["/dev/zero", "not a regular file"])


@pytest.mark.skipif(os.geteuid() == 0, reason="runs as root here: root reads a chmod 000 file, "
                                              "so an unreadable config cannot be made")
def test_an_unreadable_config(tmp_path, capsys):
    from conftest import write_h2_study

    path = write_h2_study(tmp_path)
    path.chmod(0)
    rc, out, err = call_main(capsys, "check", path, "--out", tmp_path / "out")
    assert_one_line_error(rc, out, err, [path.name, "cannot be read", "Permission denied"])


def test_an_unreadable_config_as_root_is_simulated(tmp_path, capsys, monkeypatch):
    """As root, chmod 000 cannot stop a read; make open fail the way it would for a user."""
    from conftest import write_h2_study

    path = write_h2_study(tmp_path)

    def denied(*a, **k):
        raise PermissionError(13, "Permission denied", str(path))

    monkeypatch.setattr(study_module, "open", denied, raising=False)
    rc, out, err = call_main(capsys, "check", path, "--out", tmp_path / "out")
    assert_one_line_error(rc, out, err, [path.name, "cannot be read", "Permission denied"])
