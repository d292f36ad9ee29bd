"""report.html: self-contained, every chart inlined, cautions and provenance, renders in a browser."""
import re
import shutil
import subprocess
import tempfile

import numpy as np
import pytest

from flamecharts import load_study, run_study
from flamecharts.design import fuel_gas_table
from flamecharts.outputs.charts import draw_all
from flamecharts.outputs.report import write_report

from conftest import write_h2_study

BURNER = """
[burner]
name = "report rig"
port = "slot"
port_gap_mm = 1.5
port_velocity_m_s = 5.0
"""


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    folder = tmp_path_factory.mktemp("report")
    config = write_h2_study(folder, phis="[0.08, 0.8, 1.2]", pressures="[1.0, 2.0]")
    config.write_text(config.read_text() + BURNER)
    study = load_study(config)
    rows = run_study(study, out_dir=folder / "o", jobs=2).rows
    charts = {p.stem for p in draw_all(rows, fuel_gas_table(study), study, folder / "o")}
    return write_report(study, rows, folder / "o"), charts


def test_report_is_self_contained_with_every_chart(report):
    path, charts = report
    text = path.read_text()
    for name in charts:
        assert f"<figure id='{name}'><svg" in text
    # nothing to fetch: no external scripts, styles, images or links (xmlns names are not requests)
    assert not re.search(r"""(src|href)\s*=\s*["']https?:""", text)
    assert "<script" not in text and "<link" not in text and "@import" not in text
    assert "not certification" in text and "sha256" in text and "Cantera" in text
    # what the mechanism was built for, from the packaged table (Cantera's h2o2.yaml description)
    assert "mechanism built for" in text and "hydrogen-oxygen reactions of GRI-Mech 3.0" in text
    assert "Points without a flame" in text and "no_flame" in text  # phi 0.08 is recorded, with its reason
    appendix = text.split("<h2 id='points'>Appendix: every point</h2>")[1]
    assert appendix.count("<tr>") == 1 + 12  # header and every point (2 blends x 3 phi x 2 p)
    assert "break-inside: avoid" in text and "@page" in text  # printed tables stay whole


def test_report_renders_in_headless_chromium(report, tmp_path):
    path, _ = report
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    if browser is None:
        pytest.skip("chromium is not installed (.ci/run installs Debian's chromium package)")
    shot = tmp_path / "report.png"
    subprocess.run([browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
                    "--disable-background-networking", "--disable-component-update", "--disable-sync",
                    f"--user-data-dir={tempfile.mkdtemp()}", "--host-resolver-rules=MAP * ~NOTFOUND",
                    "--window-size=1280,3000", f"--screenshot={shot}", path.as_uri()],
                   capture_output=True, timeout=120, check=True)
    import matplotlib.image as mpimg
    assert np.asarray(mpimg.imread(shot)).std() > 0.05


def test_a_flame_on_a_bluff_body_shows_the_stabilizer_margin_that_decides_its_verdict(tmp_path, capsys):
    """A bluff-body flameholder: the points table of the report and of `run` show the stabilizer
    margin (SM) beside the verdict it decides, not the rim's blowoff margin, which does not apply."""
    from flamecharts.cli.tables import print_points
    from flamecharts.outputs.report import _points_appendix

    burner = ('[burner]\nname = "holder"\nport = "round"\nport_diameter_mm = 20.0\nport_velocity_m_s = 20.0\n'
              'stabilizer_size_mm = 8.0\napproach_velocity_m_s = 20.0\n'
              '\n[indicators]\nbluff_body_constant = 1.0\n')  # invented: stands for a rig calibration
    cfg = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.8]", extra=burner)
    study = load_study(cfg)
    rows = run_study(study, out_dir=tmp_path / "out", jobs=1).rows
    (r,) = rows
    assert r["stabilizer_margin"] is not None and r["stabilizer_margin"] != r["blowoff_margin"]
    html = _points_appendix(study, rows)
    assert "<th>SM</th>" in html and f"{r['stabilizer_margin']:.2f}" in html
    print_points(study, rows)
    out = capsys.readouterr().out
    assert " SM " in out and f"{r['stabilizer_margin']:5.2f}" in out
