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


def test_limit_searches_time_left_falls_with_the_flames_still_open():
    """The newcomer's demo said 3 min -> 5 min -> 8 min -> 2 min left while the real remainder was
    about 4, 3, 2 and 0.5 min: the share done counted searches answered, which stays put while the
    open searches refine their edges. Now the time left is the flames the open searches can still
    ask for at the measured wall time per limit flame; a synthetic sequence of rounds (7 searches,
    each round 6 flames in 60 s, the flames left shrinking) must give a time left that never climbs."""
    from flamecharts.admissible import LimitsProgress
    from flamecharts.pipeline import _limits_part

    events: list[Progress] = []
    report = _limits_part(events.append)
    assert report is not None
    # (round, open searches, flames solved, elapsed s, flames the open ones can still ask for)
    rounds = [(1, 7, 7, 60.0, 30), (2, 5, 13, 120.0, 24), (3, 5, 19, 180.0, 18), (4, 4, 25, 240.0, 12),
              (5, 2, 31, 300.0, 6), (6, 1, 34, 330.0, 3), (7, 0, 36, 350.0, 0)]
    for rnd, open_, solved, elapsed, left in rounds:
        report(LimitsProgress(rnd, open_, 7, solved, elapsed, left))
    left_s = [e.remaining_s for e in events]
    assert all(b <= a for a, b in zip(left_s, left_s[1:])), left_s
    # round 2 of the demo: 13 flames in 120 s, 24 to go -> about 221 s (the old rule said 5 min, then 8)
    assert round(left_s[1]) == round(120.0 / 13 * 24) and left_s[-1] == 0.0
    # the old rule (searches answered of all) climbed on the same rounds: rounds 2 and 3 answer none more
    old = [e.elapsed_s * (1 - e.done / e.total) / (e.done / e.total) for e in events[1:3]]
    assert old[1] > old[0]


def test_the_driver_counts_the_flames_the_open_searches_can_still_need():
    """flames_left: each open search's budget (check's count: edges possible x Brent steps per edge)
    less the flames it asked for, at least its next request; answered searches count nothing."""
    from flamecharts.admissible.driver import _Search, flames_left

    a = _Search("equivalence_ratio", {}, None, budget=8, asked=3, request=[0.71])
    b = _Search("equivalence_ratio", {}, None, budget=4, asked=6, request=[0.9, 1.1])  # past its budget
    done = _Search("equivalence_ratio", {}, None, budget=8, asked=2, request=None)
    assert flames_left([a, b, done]) == 5 + 2
    a.asked, a.request = 8, None
    assert flames_left([a, b, done]) == 2


class _SlowBackend:
    """One worker thread whose tasks take ``seconds`` each: an extra solve that runs long."""

    slots = 1

    def __init__(self, seconds: float) -> None:
        self.seconds = seconds

    def executor(self, study):
        from concurrent.futures import ThreadPoolExecutor

        self.pool = ThreadPoolExecutor(1)
        return self.pool


class _NoStore:
    def commit_point(self, rec, result, run_id):
        pass


def test_a_long_extra_solve_says_its_estimate_and_beats_while_it_runs(monkeypatch):
    """A strained-flame ladder printed nothing until it ended (`1/1 done, 86 s elapsed`; GRI-Mech 3.0
    ladders run 5-15 min). Now the extras loop reports its start with the analysis's estimate and,
    while none finishes, a heartbeat through the same progress event; the display prints a start
    line, then lines with the elapsed time and the time left (a monkeypatched short heartbeat and
    clock stand in for minutes)."""
    import time

    from flamecharts.cli import progress as progress_module
    from flamecharts.pipeline import _part
    from flamecharts.sweep import extras

    monkeypatch.setattr(extras, "HEARTBEAT_S", 0.2)
    monkeypatch.setattr(extras, "task_function", lambda name: lambda task: (time.sleep(1.3), {"status": "ok"})[1])
    events: list[Progress] = []
    rec = extras.Record(key="k", family="stretch:h2", phi=0.7, pressure_bar=1.0, T_u=300.0, inputs={})
    n, _ = extras.solve_extras(None, _NoStore(), [(rec, {})], "any", _SlowBackend(1.3), _part(events.append,
                               "strained-flame ladders"), estimate_s=1.0)
    assert n == 1
    assert (events[0].done, events[0].estimate_s) == (0, 1.0) and events[0].remaining_s is not None
    beats = [e for e in events if e.done == 0]
    assert len(beats) >= 2 and beats[-1].elapsed_s >= 0.2  # the start, then a beat at each wait while it ran
    assert events[-1].done == 1

    # the display: a start line with the estimate, heartbeats (each 30 s apart on its clock), the end
    clock = iter([0.0, 35.0, 70.0, 100.0])
    monkeypatch.setattr(progress_module.time, "monotonic", lambda: next(clock))
    out = io.StringIO()
    show = ProgressDisplay(stream=out)
    what = "strained-flame ladders"
    for done, elapsed in ((0, 0.1), (0, 35.0), (0, 70.0), (1, 100.0)):
        show(Progress(done, 1, 0, 0, 0, elapsed_s=elapsed, what=what, estimate_s=60.0, done_share=float(done)))
    assert out.getvalue().splitlines() == [
        "flamecharts: strained-flame ladders: 1 to solve, estimated about 60 s with the cores free",
        "flamecharts: strained-flame ladders: 0/1 done, 35 s elapsed, about 25 s left",
        "flamecharts: strained-flame ladders: 0/1 done, 70 s elapsed, past the estimated 60 s",
        "flamecharts: strained-flame ladders: 1/1 done, 2 min elapsed"]


def test_no_line_says_zero_seconds_left():
    """'about 0 s left' said nothing: the last moments say 'finishing'."""
    out = io.StringIO()
    show = ProgressDisplay(stream=out)
    show(Progress(0, 6, 0, 0, 0, elapsed_s=0.1, what="flame-speed sensitivities", done_share=0.0))
    for done in range(1, 7):
        show(Progress(done, 6, 0, 0, 0, elapsed_s=2.0 + 0.05 * done, what="flame-speed sensitivities",
                      done_share=done / 6 if done < 5 else 0.999))
    assert "about 0 s left" not in out.getvalue() and "finishing" in out.getvalue()
