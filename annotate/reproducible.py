"""Outputs that depend on their inputs only: no run time, no random ids.

Two runs of ``size`` on the same input give byte-identical files (issue 18,
item 10).  The libraries we write with stamp each save: ezdxf writes the save
time into ``$TDUPDATE``/``$TDUUPDATE``, a fresh random ``$VERSIONGUID`` and a
time-stamped "written by" marker; ifcopenshell gives every new entity a random
GlobalId.  This module pins those to values derived from the input.

References
----------
.. [1] reproducible-builds.org, "Timestamps" and "Deterministic build systems"
   (common practice): a file carries no time of the run; ids come from content.
.. [2] Autodesk DXF Reference, HEADER section: ``$TDCREATE``, ``$TDUPDATE``
   (Julian dates), ``$VERSIONGUID`` ("uniquely identifies a particular version").
.. [3] ezdxf documentation, "ezdxf Metadata" (``Drawing.ezdxf_metadata``,
   ``WRITTEN_BY_EZDXF``).
.. [4] RFC 4122, section 4.3: name-based UUIDs (``uuid.uuid5``); ISO 16739-1:2018,
   IfcGloballyUniqueId (the 22-character compressed form).
"""

from __future__ import annotations

import hashlib
import itertools
import os
import uuid
from collections.abc import Iterable, Iterator
from contextlib import contextmanager
from typing import Any

__all__ = ["file_digest", "dxf_version_guid", "keep_classes_stable", "pin_dxf_metadata",
           "seeded_ifc_guids", "stable_relation_order", "FIXED_JULIAN_DATE"]

#: 2000-01-01 00:00 as a Julian date, the date ezdxf itself writes for
#: reproducible files (``ezdxf.options.write_fixed_meta_data_for_testing``);
#: used for drawings we make ourselves (the plan view of an IFC model).
FIXED_JULIAN_DATE = 2451544.5

#: Namespace of our name-based UUIDs [4]_ (a uuid5 of the project's name).
_NAMESPACE = uuid.uuid5(uuid.NAMESPACE_URL, "cablewright")


def file_digest(path: str | os.PathLike[str]) -> str:
    """SHA-256 of a file's bytes, hex."""
    sha = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            sha.update(chunk)
    return sha.hexdigest()


def dxf_version_guid(seed: str) -> str:
    """``$VERSIONGUID`` of the annotated copy: a name-based UUID of ``seed`` [2]_ [4]_."""
    return "{" + str(uuid.uuid5(_NAMESPACE, f"dxf:{seed}")).upper() + "}"


def pin_dxf_metadata(doc: Any, seed: str, *, own_drawing: bool = False) -> None:
    """Make the next save of ``doc`` write no run time and no random GUID.

    The annotated copy keeps the input drawing's creation and update dates
    (our marks carry no date); a drawing we made ourselves (``own_drawing``)
    gets :data:`FIXED_JULIAN_DATE` and a fingerprint GUID derived from ``seed``.  ``$VERSIONGUID`` becomes a name-based
    UUID of ``seed`` (e.g. the input's digest), the "written by" marker the
    ezdxf version alone.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
        The document about to be saved.
    seed : str
        Text the version GUID is derived from (the same seed, the same GUID).

    Notes
    -----
    ezdxf refreshes these values inside ``Drawing.saveas`` (its
    ``_update_metadata`` step); the document's own step is wrapped so the
    pinned values are put back right after it, before the sections are written.
    """
    import ezdxf
    from ezdxf.document import CREATED_BY_EZDXF, WRITTEN_BY_EZDXF

    header = doc.header
    if own_drawing:
        dates = {key: FIXED_JULIAN_DATE for key in ("$TDCREATE", "$TDUCREATE", "$TDUPDATE", "$TDUUPDATE")}
    else:
        # ezdxf sets $TDCREATE to the time of reading; the input's own creation
        # time survives in $TDUCREATE (UTC), which stands for both
        created = header.get("$TDUCREATE") or header.get("$TDUPDATE") or FIXED_JULIAN_DATE
        dates = {"$TDCREATE": created, "$TDUCREATE": created,
                 "$TDUPDATE": header.get("$TDUPDATE") or created,
                 "$TDUUPDATE": header.get("$TDUUPDATE") or header.get("$TDUPDATE") or created}
    version_guid = dxf_version_guid(seed)
    fingerprint_guid = "{" + str(uuid.uuid5(_NAMESPACE, f"dxf-fingerprint:{seed}")).upper() + "}"
    keep_classes_stable(doc)
    original = doc._update_metadata

    def update_metadata() -> None:
        original()
        for key, value in dates.items():
            header[key] = value
        if doc.dxfversion > "AC1009":
            header["$VERSIONGUID"] = version_guid
            if own_drawing:  # a new drawing's identity, random in ezdxf.new
                header["$FINGERPRINTGUID"] = fingerprint_guid
        meta = doc.ezdxf_metadata()
        meta[WRITTEN_BY_EZDXF] = f"ezdxf {ezdxf.__version__}"
        if own_drawing:
            meta[CREATED_BY_EZDXF] = f"ezdxf {ezdxf.__version__}"

    doc._update_metadata = update_metadata


def keep_classes_stable(doc: Any) -> None:
    """Make the next saves of ``doc`` write its CLASSES section in a stable order
    (see :func:`_classes_in_stable_order`)."""
    if doc.dxfversion <= "AC1009":
        return  # R12 has no CLASSES section
    loaded = list(doc.classes.classes)
    original = doc._update_metadata

    def update_metadata() -> None:
        original()  # after ezdxf added the classes it needs (Drawing.update_all)
        _classes_in_stable_order(doc, loaded)

    doc._update_metadata = update_metadata


def _classes_in_stable_order(doc: Any, loaded: list[Any]) -> None:
    """CLASSES as read, then the ones ezdxf added while saving, sorted by name.

    ezdxf adds the classes of the entity types in use from a set, whose order
    follows Python's string hash (``PYTHONHASHSEED``), so two runs could write
    the section in different orders (seen on the IFC plan view).  Only the added
    ones move; a class read from the drawing keeps its place (DXF numbers proxy
    classes by position, DXF Reference "CLASSES Section").
    """
    classes = doc.classes.classes
    kept = [k for k in loaded if k in classes]
    added = sorted((k for k in classes if k not in set(loaded)), key=str)
    ordered = {k: classes[k] for k in (*kept, *added)}
    classes.clear()
    classes.update(ordered)


@contextmanager
def seeded_ifc_guids(seed: str) -> Iterator[None]:
    """Within the block, new IFC GlobalIds are name-based UUIDs of ``seed`` and a count.

    ifcopenshell's API asks ``ifcopenshell.guid.new()`` for every entity it
    creates; inside this block that returns ``uuid5(seed, n)`` for n = 0, 1, ...
    in the 22-character IFC form, so the same input and the same results give
    the same ids [4]_.  Restored on leaving the block.
    """
    import ifcopenshell.guid as guid_module

    counter = itertools.count()
    original = guid_module.new

    def new() -> str:
        return guid_module.compress(uuid.uuid5(_NAMESPACE, f"ifc:{seed}:{next(counter)}").hex)

    guid_module.new = new
    try:
        yield
    finally:
        guid_module.new = original


#: Attributes of IFC relationships holding a SET of objects (ISO 16739-1:2018,
#: IfcRelContainedInSpatialStructure, IfcRelAssigns, IfcRelDefinesByProperties).
_SET_ATTRIBUTES = ("RelatedElements", "RelatedObjects")


def stable_relation_order(model: Any, touched: Iterable[Any]) -> int:
    """Sort the member lists of the relationships that reference ``touched``, by entity id.

    ifcopenshell's API rebuilds such lists from a Python ``set`` (containment,
    group assignment), whose order changes from run to run; the IFC types are
    SETs, so their order carries no meaning and sorting loses nothing [4]_.

    Parameters
    ----------
    model : ifcopenshell.file
        The model about to be written.
    touched : iterable of ifcopenshell.entity_instance
        The entities our writer added or changed.

    Returns
    -------
    int
        How many relationships were put in order.
    """
    done: set[int] = set()
    for entity in touched:
        for rel in model.get_inverse(entity):
            if rel.id() in done:
                continue
            for name in _SET_ATTRIBUTES:
                members = getattr(rel, name, None) if hasattr(rel, name) else None
                if isinstance(members, (tuple, list)) and len(members) > 1:
                    setattr(rel, name, sorted(members, key=lambda e: e.id()))
            done.add(rel.id())
    return len(done)
