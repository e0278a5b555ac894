"""What advising learns of one frame that no question changes (its profile, the working columns,
whole-frame findings such as repeated rows), kept for the next question on the same frame.

A FrameMemo belongs to whoever asks many questions of one frame (the notebook panel). It is
valid while the frame is the same object with the same shape, columns and dtypes; any change of
those starts it afresh. It cannot see values changed in place (``df.loc[3, "x"] = 0``), so it is
never shared beyond one panel's life, and plain ``advise()`` calls use none.

Engine code asks ``memo_get(key, make)``: with no memo in force that is just ``make()``.
"""

from __future__ import annotations

import threading
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from contextvars import ContextVar
from typing import Any


def fingerprint(frame: object) -> tuple:
    """The frame's identity, shape, column names and dtypes (what a memo's answers depend on
    and a cheap look can check)."""
    shape = getattr(frame, "shape", None)
    columns = getattr(frame, "columns", None)
    dtypes = getattr(frame, "dtypes", None)
    try:
        names = tuple(map(str, columns)) if columns is not None else ()
        kinds = tuple(map(str, dtypes)) if dtypes is not None and hasattr(dtypes, "__iter__") \
            else ()
    except TypeError:
        names, kinds = (), ()
    return id(frame), shape, names, kinds


class FrameMemo:
    """Answers about one frame, by key; cleared when the frame's fingerprint changes."""

    def __init__(self, frame: object):
        self.frame = frame  # held, so its id cannot be reused by another object
        self._print = fingerprint(frame)
        self._store: dict[tuple, Any] = {}
        self._lock = threading.Lock()
        self.hits = 0  # answers given from the memo (tests count them)

    def valid_for(self, frame: object) -> bool:
        return frame is self.frame and fingerprint(frame) == self._print

    def get(self, key: tuple, make: Callable[[], Any]) -> Any:
        with self._lock:
            if key in self._store:
                self.hits += 1
                return self._store[key]
        value = make()
        with self._lock:
            self._store.setdefault(key, value)
        return value


_CURRENT: ContextVar[FrameMemo | None] = ContextVar("plotwise_frame_memo", default=None)


@contextmanager
def using(memo: FrameMemo | None, frame: object) -> Iterator[None]:
    """Let engine code reuse ``memo``'s answers while advising on ``frame`` (nothing is reused
    when the memo belongs to another frame or the frame has changed shape, columns or dtypes)."""
    if memo is not None and not memo.valid_for(frame):
        memo = None
    token = _CURRENT.set(memo)
    try:
        yield
    finally:
        _CURRENT.reset(token)


@contextmanager
def within_one_call(frame: object) -> Iterator[None]:
    """A memo for one computation on ``frame`` (several questions asking the same thing answer
    it once) when no longer-lived memo is in force."""
    if _CURRENT.get() is not None:
        yield
        return
    with using(FrameMemo(frame), frame):
        yield


def memo_get(key: tuple, make: Callable[[], Any], about: object = None) -> Any:
    """``make()``, or its earlier answer for the same frame when a memo is in force.

    ``about``: the object the answer is about when it is not the memo's frame (a working copy,
    an engine's sample). The memo then keys by that object and holds it, so its id is never
    another object's while the answer is kept."""
    memo = _CURRENT.get()
    if memo is None:
        return make()
    if about is None or about is memo.frame:
        return memo.get(key, make)
    return memo.get((id(about),) + key, lambda: (about, make()))[1]
