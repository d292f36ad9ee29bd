"""Progress of a run: plain lines without a terminal, and a time left from the plan's estimate."""
import io

from flamecharts.cli.progress import ProgressDisplay
from flamecharts.sweep.run import Progress

from conftest import run_cli, write_h2_study


def test_time_left_starts_from_the_estimate_and_follows_the_cost_done():
    assert Progress(0, 10, 0, 0, 0, elapsed_s=5.0, estimate_s=100.0).remaining_s == 95.0
    # a quarter of the estimated cost done in 40 s: three quarters take 120 s more
    assert Progress(1, 10, 0, 0, 0, elapsed_s=40.0, estimate_s=100.0, done_share=0.25).remaining_s == 120.0
    assert Progress(0, 10, 0, 0, 0, elapsed_s=5.0).remaining_s is None


def test_without_a_terminal_progress_is_plain_lines():
    out = io.StringIO()
    show = ProgressDisplay(stream=out)
    show(Progress(0, 20, 0, 0, 3, elapsed_s=0.1, estimate_s=600.0))
    for done in range(1, 21):
        show(Progress(done, 20, 0, 0, 3, elapsed_s=10.0 * done, estimate_s=600.0, done_share=done / 20))
    lines = out.getvalue().splitlines()
    assert lines[0] == "flamecharts: 20 flames to solve, 3 from the store; these estimated 10 min with the cores free"
    assert lines[1].startswith("flamecharts: 2/20 flames, 0 no flame, 0 failed, 20 s elapsed, about 3 min left")
    assert lines[-1] == "flamecharts: 20/20 flames, 0 no flame, 0 failed, 3 min elapsed"
    assert len(lines) == 11  # the first line, then every 10 % of the flames
    assert "\r" not in out.getvalue()


def test_extra_solves_and_limits_report_elapsed_time_and_time_left():
    """One event type for every part of a run: the extras and the limit searches get plain lines
    with their elapsed time and the time left from the share done (a new user's runs showed
    neither for them)."""
    out = io.StringIO()
    show = ProgressDisplay(stream=out)
    show(Progress(4, 4, 0, 0, 0, elapsed_s=8.0, done_share=1.0))  # the sweep's last flame
    for done in range(1, 11):
        show(Progress(done, 10, 0, 0, 0, elapsed_s=30.0 * done, what="flame-speed sensitivities",
                      done_share=done / 10))
    show(Progress(1, 4, 0, 0, 0, elapsed_s=50.0, what="limits", detail="round 1, 6 flames solved", done_share=0.25))
    lines = out.getvalue().splitlines()
    sens = [line for line in lines if "flame-speed sensitivities" in line]
    assert sens[0] == "flamecharts: flame-speed sensitivities: 1/10 done, 30 s elapsed, about 4 min left"
    assert sens[-1] == "flamecharts: flame-speed sensitivities: 10/10 done, 5 min elapsed"
    assert lines[-1] == ("flamecharts: limits: 1 of 4 searches answered (round 1, 6 flames solved), 50 s elapsed, "
                         "about 2 min left")


def test_a_run_reports_its_extras_through_the_one_progress_callback(tmp_path):
    import flamecharts

    config = write_h2_study(tmp_path, fractions="[0.0, 0.5]", phis="[0.8, 1.0]", extra="")
    config.write_text(config.read_text() + "\n[uncertainty]\n\n[burner]\nport = 'round'\nport_diameter_mm = 1.0\n"
                      "port_velocity_m_s = 4.0\nmin_flashback_margin = 3.0\n\n[limits]\ncriteria = ['flashback']\n")
    events = []
    flamecharts.run(config, out=tmp_path / "out", jobs=1, charts=False, progress=events.append)
    parts = {e.what for e in events}
    assert parts == {"flames", "flame-speed sensitivities", "limit flames", "limits"}, parts
    assert all(e.elapsed_s >= 0 for e in events)
    last = [e for e in events if e.what == "flame-speed sensitivities"][-1]
    assert (last.done, last.total) == (4, 4) and last.elapsed_s > 0 and last.remaining_s == 0.0


def test_a_run_into_a_log_file_shows_progress_lines(tmp_path):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.8, 1.0]")
    r = run_cli("run", config, "--out", tmp_path / "out", "--jobs", "1", "--no-charts")
    assert r.returncode == 0, r.stderr
    assert "flamecharts: 2 flames to solve" in r.stderr and "flamecharts: 2/2 flames" in r.stderr
