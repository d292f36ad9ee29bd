"""Progress of a run on stderr: a bar on a terminal, plain lines in a log file or batch job."""
from __future__ import annotations

import sys
import time
from typing import TYPE_CHECKING, TextIO

from tqdm import tqdm

if TYPE_CHECKING:
    from ..sweep.run import Progress

#: Without a terminal, a line every this many seconds ...
LINE_EVERY_S = 60.0
#: ... or every this share of the flames, whichever comes first.
LINE_EVERY_SHARE = 0.1
#: While an extra solve runs and none finishes (a strained-flame ladder: minutes), a line every
#: this many seconds with the elapsed time and the time left (the library reports every
#: sweep.extras.HEARTBEAT_S).
HEARTBEAT_LINE_S = 30.0


def plural(n: int, word: str) -> str:
    """'1 point', '2 points'.

    >>> plural(1, "point"), plural(28, "flame")
    ('1 point', '28 flames')
    """
    return f"{n} {word}" if n == 1 else f"{n} {word}s"


def duration(seconds: float) -> str:
    """'45 s', '3 min', '2 h 5 min', '2.1 days'.

    >>> duration(45.2), duration(200), duration(4800), duration(7500), duration(50 * 3600)
    ('45 s', '3 min', '80 min', '2 h 5 min', '2.1 days')
    """
    if seconds < 90:
        return f"{seconds:.0f} s"
    if seconds < 5400:
        return f"{seconds / 60:.0f} min"
    if seconds < 48 * 3600:
        return f"{seconds // 3600:.0f} h {seconds % 3600 / 60:.0f} min"
    return f"{seconds / 86400:.1f} days"


def left_words(pr: Progress) -> str:
    """The time left of a progress event in words: 'about 3 min left'; 'finishing' when under
    half a second is left; while nothing has finished and the estimate is spent, 'past the
    estimated 30 s' (a count of zero seconds would be wrong); '' without an estimate.

    >>> from flamecharts.sweep.run import Progress
    >>> [left_words(Progress(d, 2, 0, 0, 0, elapsed_s=t, estimate_s=30.0, done_share=d / 2))
    ...  for d, t in ((0, 10.0), (1, 60.0), (0, 45.0), (1, 600.0))]
    ['about 20 s left', 'about 60 s left', 'past the estimated 30 s', 'about 10 min left']
    >>> left_words(Progress(99, 100, 0, 0, 0, elapsed_s=20.0, done_share=0.99))
    'finishing'
    """
    left = pr.remaining_s
    if left is None:
        return ""
    if pr.done_share <= 0 and pr.estimate_s is not None and pr.elapsed_s >= pr.estimate_s:
        return f"past the estimated {duration(pr.estimate_s)}"
    return "finishing" if left < 0.5 else f"about {duration(left)} left"


class ProgressDisplay:
    """The progress callback of ``flamecharts run``: a tqdm bar whose time left comes from the
    plan's estimate refined by the measured cost (Progress.remaining_s), or, when stderr is
    not a terminal, a plain line every LINE_EVERY_S seconds or LINE_EVERY_SHARE of the flames."""

    def __init__(self, quiet: bool = False, stream: TextIO | None = None, whole_run_s: float | None = None) -> None:
        self.quiet = quiet
        self.stream = stream or sys.stderr
        self.terminal = hasattr(self.stream, "isatty") and self.stream.isatty()
        self.bar: tqdm | None = None
        self.told_stop = False
        self._last_line_t: float | None = None
        self._last_line_done = -1
        self._stage = ""
        self._what = "flames"
        self.whole_run_s = whole_run_s  # `check`'s estimate of the whole run, said once when work starts

    def __call__(self, pr: Progress) -> None:
        if pr.stopping and not self.told_stop:
            self.told_stop = True
            print("\nCtrl-C: no new flames are started; the running ones finish and are stored "
                  "(Ctrl-C again to stop at once).", file=self.stream)
        if self.quiet or pr.total == 0:
            return
        if self.whole_run_s:
            print(f"flamecharts: the whole run (sweep, limit searches, extra solves and outputs) is estimated at about "
                  f"{duration(self.whole_run_s)} with the cores free", file=self.stream, flush=True)
            self.whole_run_s = None
        if pr.stage != self._stage or pr.what != self._what:  # the next mechanism, or the next part of the run:
            self.close()                                       # a bar (or line count) of its own
            self._stage, self._what, self._last_line_t, self._last_line_done = pr.stage, pr.what, None, -1
        left_text = left_words(pr)
        if pr.what != "flames":
            self._part_line(pr, left_text)
        elif self.terminal:
            self._bar(pr, left_text)
        else:
            self._line(pr, left_text)

    def _due(self, pr: Progress, heartbeat: bool = False) -> bool:
        """Whether a plain line is due: every LINE_EVERY_SHARE of the work or LINE_EVERY_S
        seconds, and at the end; with ``heartbeat`` (an extra solve), also every HEARTBEAT_LINE_S
        while nothing finishes."""
        now = time.monotonic()
        step = max(1, round(LINE_EVERY_SHARE * pr.total))
        assert self._last_line_t is not None
        if heartbeat and pr.done == self._last_line_done and pr.done < pr.total:
            due = now - self._last_line_t >= HEARTBEAT_LINE_S
        else:
            due = pr.done != self._last_line_done and (
                pr.done >= self._last_line_done + step or now - self._last_line_t >= LINE_EVERY_S
                or pr.done == pr.total)
        if not due:
            return False
        self._last_line_t, self._last_line_done = now, pr.done
        return True

    def _part_line(self, pr: Progress, left_text: str) -> None:
        """A plain line for the extra solves and the limit searches (also on a terminal: they come
        after the sweep's bar), with the elapsed time and the time left."""
        if pr.what == "mechanism reduction":  # a few lines, each a step of the one reduction
            print(f"flamecharts: mechanism reduction: {pr.detail}", file=self.stream, flush=True)
            return
        head = f"flamecharts: {pr.stage + ': ' if pr.stage else ''}{pr.what}: "
        if self._last_line_t is None:
            self._last_line_t, self._last_line_done = time.monotonic(), pr.done
            if pr.done == 0 and pr.what != "limits":  # the start of an extra solve: what it is estimated at
                print(head + f"{pr.total} to solve" + (f", estimated about {duration(pr.estimate_s)} with the cores free"
                                                       if pr.estimate_s is not None else ""),
                      file=self.stream, flush=True)
                return
        elif not self._due(pr, heartbeat=pr.what != "limits"):
            return
        count = (f"{pr.done} of {pr.total} searches answered ({pr.detail})" if pr.what == "limits"
                 else f"{pr.done}/{pr.total} done")
        print(head + f"{count}, {duration(pr.elapsed_s)} elapsed"
              + (f", {left_text}" if left_text and pr.done < pr.total else ""), file=self.stream, flush=True)

    def _bar(self, pr: Progress, left_text: str) -> None:
        if self.bar is None:
            self.bar = tqdm(total=pr.total, unit="flame", file=self.stream, dynamic_ncols=True,
                            desc=f"{pr.stage + ': ' if pr.stage else ''}flames ({pr.reused} from the store)",
                            bar_format="{desc}: {percentage:3.0f}%|{bar}| {n_fmt}/{total_fmt} [{elapsed}{postfix}]")
        self.bar.set_postfix_str(f"{pr.no_flame} no flame, {pr.failed} failed" + (f", {left_text}" if left_text else ""),
                                 refresh=False)
        self.bar.update(pr.done - self.bar.n)

    def _line(self, pr: Progress, left_text: str) -> None:
        if self._last_line_t is None:
            self._last_line_t, self._last_line_done = time.monotonic(), pr.done
            print(f"flamecharts: {pr.stage + ': ' if pr.stage else ''}{pr.total} flames to solve, "
                  f"{pr.reused} from the store"
                  + (f"; these estimated {duration(pr.estimate_s)} with the cores free" if pr.estimate_s is not None else ""),
                  file=self.stream, flush=True)
            return
        if not self._due(pr):
            return
        print(f"flamecharts: {pr.done}/{pr.total} flames, {pr.no_flame} no flame, {pr.failed} failed, "
              f"{duration(pr.elapsed_s)} elapsed" + (f", {left_text}" if left_text and pr.done < pr.total else ""),
              file=self.stream, flush=True)

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()
            self.bar = None
