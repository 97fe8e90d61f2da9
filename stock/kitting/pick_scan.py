"""Confirming a kit's picks by scanning the bins' labels, then pulling the plan.

At the bench the picker scans each bin's label as the parts come out of it. Each scan (or a bin
typed by hand) is checked against the plan at once: a bin the plan holds parts in is ticked off,
any other bin is named as not part of the plan and changes nothing. The plan is pulled only when
every one of its bins has been confirmed; :func:`pull_confirmed` checks that again inside the
pull's own transaction, so nothing is taken for a pick that was not confirmed.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from stock.errors import Refused, StockError
from stock.kitting.pick_list import pick_list
from stock.kitting.stored_plans import KitAction, pull_plan
from stock.store.database import Store


@dataclass(frozen=True)
class PickScan:
    """The answer to one scan: the bin it named (if any), the parts to take from it, what is left."""
    text: str
    bin_key: str | None
    take: int                 # parts the plan holds in this bin; 0 when the bin is not in the plan
    in_plan: bool
    remaining: tuple[str, ...]   # bins of the plan not confirmed yet, in pick order
    problem: str = ""

    def to_json(self) -> dict:
        return {"scanned": self.text, "bin": self.bin_key, "take": self.take, "in_plan": self.in_plan,
                "remaining": list(self.remaining), "problem": self.problem}


def plan_picks(store: Store, plan: int | str) -> dict[str, int]:
    """The bins a reserved plan takes parts from, in the pick list's walking order, with how many.

    Raises:
        NotFound: no such plan.
        Refused: the plan is not reserved (pulled, dropped or returned already).
    """

    picks = pick_list(store, plan)
    if picks.status != "reserved":
        raise Refused(f"pull plan {picks.plan}", f"it is {picks.status}, not reserved")
    return {row.bin_key: row.count for row in picks.rows}


def check_scan(store: Store, picks: dict[str, int], confirmed: set[str], text: str) -> PickScan:
    """Check one scanned (or typed) bin against the plan's picks; ticks it off in ``confirmed``."""
    def remaining() -> tuple[str, ...]:
        return tuple(k for k in picks if k not in confirmed)

    try:
        key = store.find_bin(text)["bin_key"]
    except StockError as exc:
        return PickScan(text, None, 0, False, remaining(), str(exc))
    if key not in picks:
        return PickScan(text, key, 0, False, remaining(),
                        f"bin {key} is not in this plan: take nothing from it")
    confirmed.add(key)
    return PickScan(text, key, picks[key], True, remaining())


def pull_confirmed(store: Store, plan: int | str, confirmed: Iterable[str]) -> KitAction:
    """Pull a plan whose every bin was confirmed by a scan; otherwise take nothing.

    Raises:
        NotFound: no such plan.
        Refused: a bin of the plan was not confirmed (they are named), or the plan is not reserved.
    """
    done = set(confirmed)
    with store.writing():
        picks = plan_picks(store, plan)
        missing = [key for key in picks if key not in done]
        if missing:
            raise Refused(f"pull plan {str(plan).strip()}",
                          f"{len(missing)} bin(s) not confirmed by a scan: {', '.join(missing)};"
                          " nothing was taken")
        return pull_plan(store, plan)


__all__ = ["PickScan", "check_scan", "plan_picks", "pull_confirmed"]
