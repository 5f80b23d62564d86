"""The boards of an installation as a tree: which board feeds which, through which circuit, in what order.

A board is fed either by the supply (``fed_from`` None: exactly one such board, the origin) or by a
circuit of its parent board that names it in ``feeds_board``. :func:`tree_of` checks that the boards form
one tree and raises :class:`~service.electrical.errors.InvalidInput` naming the field at fault
(``("boards", 2, "fed_from")``, ``("boards", 0, "circuits", 3, "feeds_board")``) for a missing parent, a
loop, a board fed by two circuits, a circuit feeding a board that is not below it, or two boards with one
id. The order it returns is top-down (every board after its parent); bottom-up is that order reversed.
"""

from __future__ import annotations

from dataclasses import dataclass

from service.electrical.errors import InvalidInput
from service.electrical.inputs import Installation


@dataclass(frozen=True)
class Tree:
    """``order``: board indices top-down; ``parent`` and ``feed`` (board, circuit indices) per board, None at
    the origin; ``depth`` per board (0 at the origin); ``phases`` per board (the supply's at the origin, the
    feed's below it)."""

    order: tuple[int, ...]
    parent: tuple[int | None, ...]
    feed: tuple[tuple[int, int] | None, ...]
    depth: tuple[int, ...]
    phases: tuple[int, ...]

    @property
    def origin(self) -> int:
        return self.order[0]

    def children(self, board: int) -> list[int]:
        return [b for b in self.order if self.parent[b] == board]


def _ids(inst: Installation) -> dict[str, int]:
    if not inst.boards:
        raise InvalidInput("boards", "an installation has at least one board: the one the supply feeds")
    ids: dict[str, int] = {}
    for i, board in enumerate(inst.boards):
        if board.id in ids:
            raise InvalidInput(("boards", i, "id"), f"board {board.id!r} appears twice: ids are unique")
        ids[board.id] = i
    return ids


def _parents(inst: Installation, ids: dict[str, int]) -> list[int | None]:
    parents: list[int | None] = []
    origins = [i for i, b in enumerate(inst.boards) if b.fed_from is None]
    if not origins:
        raise InvalidInput(("boards", 0, "fed_from"), "one board is fed by the supply (fed_from null); none is")
    if len(origins) > 1:
        raise InvalidInput(
            ("boards", origins[1], "fed_from"),
            f"only one board is fed by the supply; board {inst.boards[origins[0]].id!r} already is",
        )
    for i, board in enumerate(inst.boards):
        if board.fed_from is not None and board.fed_from not in ids:
            raise InvalidInput(("boards", i, "fed_from"), f"no board has the id {board.fed_from!r}")
        if board.fed_from == board.id:
            raise InvalidInput(("boards", i, "fed_from"), "a board cannot feed itself")
        parents.append(None if board.fed_from is None else ids[board.fed_from])
    return parents


def _feeds(inst: Installation, ids: dict[str, int], parents: list[int | None]) -> list[tuple[int, int] | None]:
    feeds: list[tuple[int, int] | None] = [None] * len(inst.boards)
    for b, board in enumerate(inst.boards):
        for c, circuit in enumerate(board.circuits):
            target = circuit.feeds_board
            if target is None:
                continue
            where = ("boards", b, "circuits", c, "feeds_board")
            if target not in ids:
                raise InvalidInput(where, f"no board has the id {target!r}")
            child = ids[target]
            if parents[child] != b:
                raise InvalidInput(where, f"board {target!r} is not fed from board {board.id!r} (its fed_from)")
            if feeds[child] is not None:
                raise InvalidInput(where, f"board {target!r} is already fed by another circuit of {board.id!r}")
            feeds[child] = (b, c)
    for b, board in enumerate(inst.boards):
        if parents[b] is not None and feeds[b] is None:
            raise InvalidInput(
                ("boards", b, "fed_from"),
                f"no circuit of board {board.fed_from!r} feeds board {board.id!r}: name it in one's feeds_board",
            )
    return feeds


def tree_of(inst: Installation) -> Tree:
    """The boards as a tree, checked (see the module's text for what is refused)."""
    ids = _ids(inst)
    parents = _parents(inst, ids)
    feeds = _feeds(inst, ids, parents)
    origin = parents.index(None)
    order, depth, phases = [origin], [0] * len(parents), [inst.supply.phases] * len(parents)
    for board in order:  # grows while it is walked: breadth first from the origin
        for child in (i for i, p in enumerate(parents) if p == board):
            b, c = feeds[child]  # type: ignore[misc]
            depth[child], phases[child] = depth[board] + 1, getattr(inst.boards[b].circuits[c], "phases", 1)
            order.append(child)
    if len(order) < len(parents):
        stranded = min(set(range(len(parents))) - set(order))
        raise InvalidInput(
            ("boards", stranded, "fed_from"),
            f"board {inst.boards[stranded].id!r} is in a loop of boards that never reaches the supply",
        )
    for b in order[1:]:
        if inst.boards[b].device is not None:
            raise InvalidInput(
                ("boards", b, "device"),
                "a board fed from another is protected by the circuit that feeds it: give the device there",
            )
    return Tree(tuple(order), tuple(parents), tuple(feeds), tuple(depth), tuple(phases))
