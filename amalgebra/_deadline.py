r"""Deadlines that interrupt running work: one ``SIGALRM`` timer shared by nested guards.

Explanation
===========

A :class:`Deadline` is a point in time (``seconds`` from its creation, on the
monotonic clock; ``seconds=None`` means no limit).  :func:`armed` runs a block
under it: when the deadline passes, :class:`DeadlineExpired` is raised *inside*
whatever Python code is running (a SymPy routine included), through the real-time
interval timer (``signal.setitimer(ITIMER_REAL)``).  :class:`DeadlineExpired` is
a ``BaseException`` so that library code catching ``Exception`` lets it out;
the timer re-fires every 50 ms while the deadline stays expired, in case a bare
``except:`` swallowed the first one.  Python drops ("ignores") an exception
raised inside a garbage-collector callback, a ``__del__`` method or a
weak-reference callback, so when the timer finds one of those running it does
not raise there: it fires again 1 ms later.

Rules of the one timer:

* **Nesting.** Guards form a stack; the timer is armed for the earliest deadline
  of the stack.  When it fires, the outermost expired deadline is raised (its
  owner has to unwind everything inside it); inner guards re-raise a deadline
  that is not theirs (``exc.deadline is not mine``).
* **An outer timer keeps its time.** A ``SIGALRM`` timer that was running when
  the first guard was entered (pytest-timeout's, say) is remembered with its
  end; if it comes first it fires first: its own handler is called at its time
  (``SIG_DFL`` is re-delivered with the default action, ``SIG_IGN`` ignored).
  When the last guard exits, the handler is put back and the timer re-armed with
  the time it has left.
* **Where no timer can be used** (not the main thread, no ``setitimer`` as on
  Windows, or a ``SIGALRM`` handler installed outside Python that Python could
  not put back), the guard arms nothing: ``deadline.hard`` is False,
  ``deadline.mode`` says why, and the work is bounded only by
  :meth:`Deadline.check` calls between its steps.

A timer cannot interrupt one long C call (a huge integer product, say): the
exception is raised when control returns to Python.

Examples
========

>>> from amalgebra._deadline import Deadline, DeadlineExpired, armed
>>> limit = Deadline(0.05)
>>> try:
...     with armed(limit):
...         while True:                        # would run forever
...             pass
... except DeadlineExpired as exc:
...     print("stopped:", exc.deadline is limit, limit.expired)
stopped: True True
>>> with armed(Deadline(None)) as free:        # None: no limit
...     free.remaining(), free.expired
(inf, False)
"""

import gc
import math
import numbers
import os
import signal
import threading
import time

__all__ = ["Deadline", "DeadlineExpired", "armed", "REFIRE_SECONDS"]

#: seconds between repeated signals while a deadline stays expired
REFIRE_SECONDS = 0.05
#: the delay of the next signal when the interrupted frame would drop the exception
_RETRY_SECONDS = 1e-3
_WEAKREF_FILES = ("weakref.py", "_weakrefset.py")


class DeadlineExpired(BaseException):
    """Raised when ``deadline`` has passed; a ``BaseException`` so that ``except Exception`` lets it out.

    ``by_timer`` is True when the timer interrupted running work, False when a check between steps found it.
    """

    def __init__(self, deadline, by_timer=False):
        super().__init__(f"time budget of {deadline.seconds:g} s spent")
        self.deadline = deadline
        self.by_timer = by_timer


class Deadline:
    """A point in time ``seconds`` from now (``None``: never); see the module docstring.

    ``name`` is the caller's parameter name, for the error message of a bad value.

    ``hard`` is True while an interrupting timer guards it; ``mode`` describes how
    it is enforced.

    >>> d = Deadline(3600)
    >>> d.expired, 3590 < d.remaining() <= 3600, d.hard
    (False, True, False)
    >>> Deadline(0).expired
    True
    """

    __slots__ = ("seconds", "end", "hard", "mode")

    def __init__(self, seconds, name="seconds"):
        if seconds is not None:
            if isinstance(seconds, bool) or not isinstance(seconds, numbers.Real):
                from .errors import NotNumericError
                raise NotNumericError(f"{name}={seconds!r} must be a number of seconds or None")
            seconds = float(seconds)
            if not seconds >= 0:
                from .errors import LimitError
                raise LimitError(f"{name}={seconds!r} must be >= 0 or None")
        self.seconds = seconds
        self.end = math.inf if seconds is None else time.monotonic() + seconds
        self.hard = False
        self.mode = "no limit" if seconds is None else "checked between steps"

    def remaining(self):
        """Seconds left (``inf`` without a limit, never negative)."""
        return max(0.0, self.end - time.monotonic())

    @property
    def expired(self):
        return time.monotonic() >= self.end

    def check(self):
        """Raise :class:`DeadlineExpired` if the deadline has passed (the check between steps)."""
        if time.monotonic() >= self.end:
            raise DeadlineExpired(self)

    def __repr__(self):
        limit = "no limit" if self.seconds is None else f"{self.seconds:g} s"
        return f"Deadline({limit}, {self.mode})"


# The state of the one timer (main thread only): our stack, the outer handler and timer.
_stack = []
_outer = {"handler": None, "end": None, "interval": 0.0}


def _why_no_timer():
    if not hasattr(signal, "setitimer"):
        return "no interval timer on this platform"
    if threading.current_thread() is not threading.main_thread():
        return "not the main thread"
    if not _stack:
        try:
            handler = signal.getsignal(signal.SIGALRM)
        except (ValueError, OSError):
            return "SIGALRM unavailable"
        if handler is None:
            return "a SIGALRM handler installed outside Python is in place"
    return ""


def _arm():
    """Arm the timer for the earliest of our deadlines and the outer timer's end."""
    ends = [d.end for d in _stack]
    if _outer["end"] is not None:
        ends.append(_outer["end"])
    if not ends:
        signal.setitimer(signal.ITIMER_REAL, 0)
        return
    delay = max(min(ends) - time.monotonic(), 1e-4)
    signal.setitimer(signal.ITIMER_REAL, delay, REFIRE_SECONDS)


def _would_drop(frame):
    """True when an exception raised in ``frame`` would be dropped by the interpreter.

    That is the case inside a garbage-collector callback (hypothesis installs one),
    a ``__del__`` method or a weak-reference callback (SymPy's caches hold weak
    dictionaries), anywhere up the chain of callers: the exception would only be
    reported as "ignored" and the interrupted work would go on.  Weak-reference
    callbacks cannot be told apart from other code of the weakref modules, so any
    frame there defers the signal; a deferral only costs a millisecond.
    """
    callbacks = {getattr(cb, "__code__", None) for cb in gc.callbacks}
    while frame is not None:
        code = frame.f_code
        if code.co_name == "__del__" or code in callbacks or code.co_filename.endswith(_WEAKREF_FILES):
            return True
        frame = frame.f_back
    return False


def _fire(signum, frame):
    now = time.monotonic()
    outer_end = _outer["end"]
    if outer_end is not None and now >= outer_end:
        # the outer timer's time has come: it goes first (its handler may raise)
        interval = _outer["interval"]
        _outer["end"] = outer_end + interval if interval > 0 else None
        _arm()
        handler = _outer["handler"]
        if callable(handler):
            handler(signum, frame)
        elif handler == signal.SIG_DFL:
            signal.signal(signal.SIGALRM, signal.SIG_DFL)
            os.kill(os.getpid(), signal.SIGALRM)     # the default action, as the outer timer would have had
        return
    for d in _stack:                                 # outermost first
        if now >= d.end:
            if _would_drop(frame):
                signal.setitimer(signal.ITIMER_REAL, _RETRY_SECONDS, REFIRE_SECONDS)
                return
            raise DeadlineExpired(d, by_timer=True)
    _arm()                                           # early (re-fire after an exit): wait for the next end


class armed:
    """Context manager: run a block under ``deadline`` (a :class:`Deadline`; see the module docstring).

    ``with armed(d):`` yields ``d``; ``d.hard`` tells whether the timer guards it.

    >>> with armed(Deadline(10)) as d:
    ...     d.hard in (True, False), d.expired
    (True, False)
    """

    __slots__ = ("deadline", "_pushed")

    def __init__(self, deadline):
        self.deadline = deadline
        self._pushed = False

    def __enter__(self):
        d = self.deadline
        if d.seconds is None:
            return d
        why = _why_no_timer()
        if why:
            d.hard = False
            d.mode = f"checked between steps only ({why})"
            return d
        if not _stack:
            _outer["handler"] = signal.getsignal(signal.SIGALRM)
            left, interval = signal.setitimer(signal.ITIMER_REAL, 0)
            _outer["end"] = time.monotonic() + left if left > 0 else None
            _outer["interval"] = interval
            signal.signal(signal.SIGALRM, _fire)
        _stack.append(d)
        self._pushed = True
        d.hard = True
        d.mode = "interrupting timer (SIGALRM)"
        _arm()
        return d

    def __exit__(self, *exc):
        if not self._pushed:
            return False
        d = self.deadline
        # first take it off the stack, so that a signal arriving now cannot raise it any more
        if _stack and _stack[-1] is d:
            _stack.pop()
        elif d in _stack:                 # exited out of order
            _stack.remove(d)
        self._pushed = False
        d.hard = False
        if _stack:
            _arm()
            return False
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, _outer["handler"])
        if _outer["end"] is not None:     # the outer timer goes on with the time it has left
            signal.setitimer(signal.ITIMER_REAL, max(_outer["end"] - time.monotonic(), 1e-4),
                             _outer["interval"])
        _outer.update(handler=None, end=None, interval=0.0)
        return False
