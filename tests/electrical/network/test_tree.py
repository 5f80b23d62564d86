"""The boards of an installation as a tree: what is refused, with the field named, and the order of the walk."""

import dataclasses

import pytest

from service.electrical.errors import InvalidInput
from service.electrical.inputs import Board, DeviceSpec, Installation, Unread
from service.electrical.network.tree import tree_of
from tests.electrical.pipeline import BAKERY, circuit

# Invented: a three-phase bakery origin with a bakehouse board and a shop board below it
THREE = dataclasses.replace(BAKERY, phases=3)
FUSE = DeviceSpec(rating_a=100, standard="BS 88-3", type="gG")


def feed(target, phases=1):
    return circuit(role="distribution", load=None, feeds_board=target, phases=phases, id=f"{target} feed")


def installation(*boards):
    return Installation(THREE, tuple(boards))


def refused(inst):
    with pytest.raises(InvalidInput) as err:
        tree_of(inst)
    return err.value.path, err.value.message


def test_the_walk_is_top_down_with_depths_and_phases():
    inst = installation(
        Board("SHOP", (circuit(),), fed_from="BAKEHOUSE"),
        Board("MAIN", (feed("BAKEHOUSE", phases=3),), device=FUSE),
        Board("BAKEHOUSE", (feed("SHOP"), circuit()), fed_from="MAIN"),
    )
    tree = tree_of(inst)
    assert tree.order == (1, 2, 0) and tree.depth == (2, 0, 1) and tree.phases == (1, 3, 3)
    assert tree.feed[0] == (2, 0) and tree.parent[0] == 2 and tree.children(1) == [2]


def test_every_bad_tree_names_its_field():
    main = Board("MAIN", (feed("A"),))
    assert refused(installation())[0] == ("boards",)
    assert refused(installation(main, Board("MAIN", ())))[0] == ("boards", 1, "id")
    assert refused(installation(Board("A", (), fed_from="B"), Board("B", (), fed_from="A")))[0] == (
        "boards",
        0,
        "fed_from",
    )
    assert refused(installation(main, Board("A", ())))[0] == ("boards", 1, "fed_from")  # two origins
    assert refused(installation(main, Board("A", (), fed_from="NOWHERE")))[0] == ("boards", 1, "fed_from")
    path, message = refused(installation(Board("MAIN", (feed("GHOST"),))))
    assert path == ("boards", 0, "circuits", 0, "feeds_board") and "GHOST" in message


def test_a_board_fed_twice_or_by_a_board_not_above_it():
    twice = installation(Board("MAIN", (feed("A"), feed("A"))), Board("A", (), fed_from="MAIN"))
    path, message = refused(twice)
    assert path == ("boards", 0, "circuits", 1, "feeds_board") and "already fed" in message
    sideways = installation(
        Board("MAIN", (feed("A"), feed("B"))), Board("A", (feed("B"),), fed_from="MAIN"), Board("B", (), fed_from="A")
    )
    assert refused(sideways)[0] == ("boards", 0, "circuits", 1, "feeds_board")
    unfed = installation(Board("MAIN", (circuit(),)), Board("A", (), fed_from="MAIN"))
    path, message = refused(unfed)
    assert path == ("boards", 1, "fed_from") and "feeds_board" in message


def test_a_loop_below_the_origin_and_a_device_on_a_sub_board():
    loop = installation(
        Board("MAIN", ()), Board("A", (feed("B"),), fed_from="B"), Board("B", (feed("A"),), fed_from="A")
    )
    path, message = refused(loop)
    assert path == ("boards", 1, "fed_from") and "loop" in message
    device = installation(Board("MAIN", (feed("A"),)), Board("A", (), fed_from="MAIN", device=FUSE))
    assert refused(device)[0] == ("boards", 1, "device")


def test_an_unread_feed_still_places_its_board():
    inst = installation(Board("MAIN", (Unread("A feed", "A"),)), Board("A", (), fed_from="MAIN"))
    assert tree_of(inst).feed[1] == (0, 0)
