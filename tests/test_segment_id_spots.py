"""Segment ids are tried from their segment's ends inwards (issue 12): a short id leaves the
middle of a short drop to the long cable labels placed before it; the box stays on the
stretch (no overhang past its ends)."""

from cablewright.annotate.drawing.spot_arrays import _along


def test_ends_first_starts_at_the_ends_and_keeps_the_box_on_the_stretch():
    length, width, height = 10.0, 2.0, 1.0
    ts = _along(length, width, height, ends_first=True)
    inner = (length - width) / 2.0  # box edge on the stretch's end
    assert ts[0] == inner and ts[1] == -inner
    assert max(abs(t) for t in ts) <= inner
    assert ts[-1] == 0.0 and len(ts) == len(set(ts))
    # the middle-out order (cable labels) reaches past the ends by the overhang
    mid = _along(length, width, height)
    assert mid[0] == 0.0 and max(abs(t) for t in mid) > inner


def test_ends_first_on_a_stretch_shorter_than_the_mark_is_its_middle():
    assert _along(1.0, 2.0, 1.0, ends_first=True) == [0.0]
