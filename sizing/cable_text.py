"""The cable as the outputs write it: one implementation for labels, schedules and reports.

The trade writes a cable by its parallel count, cores and size, conductor and
insulation, and a protective conductor when it is smaller than the phase
conductors.  Two forms are in use, both built here:

- ``"schedule"``: ``"2x 4C 240 mm² Cu/XLPE"`` (schedule files, report, drawing
  schedule table, IFC property sets, the terminal);
- ``"label"``: ``"4x240 mm² Cu/XLPE"``, the short form of a cable label on the
  drawing, whose parallel count and protective conductor are fields of their own
  (``AnnotateConfig.label_fields``), written with :func:`parallel_text` and
  :func:`pe_text`.

The size is the rule set's label (``"6 AWG"``, ``"250 kcmil"``) or, lacking
one, the area in mm² (contract.md, Extensions: ``cable.size_label``).

References
----------
.. [1] IEC 60228:2004, clause 1 and Table 1: nominal cross-sectional areas in mm².
.. [2] IEC 60364-5-54:2011, 543.1.2 and Table 54.2: a protective conductor may be
   smaller than the line conductors.
.. [3] contract.md, "Extensions": ``cable.size_label`` and the quantities' ``cable`` text.
"""

from __future__ import annotations

__all__ = ["CABLE_FORMS", "size_text", "parallel_text", "cable_text", "reduced_pe_mm2", "pe_text"]

#: How the cores and the size are joined in each form (cablewright's wording, common practice).
CABLE_FORMS = {"schedule": "{cores}C {size}", "label": "{cores}x{size}"}


def size_text(csa_mm2: float, size_label: str = "") -> str:
    """The size as the rule set writes it, else the area.

    Parameters
    ----------
    csa_mm2 : float
        Conductor cross-section [mm²].
    size_label : str
        The rule set's name of the size ("6 AWG"); "" writes the area.

    Examples
    --------
    >>> size_text(95.0), size_text(2.5), size_text(13.3, "6 AWG")
    ('95 mm²', '2.5 mm²', '6 AWG')
    """
    return size_label or f"{csa_mm2:g} mm²"


def parallel_text(parallel: int) -> str:
    """``"2x"`` for cables in parallel, "" for one cable.

    Parameters
    ----------
    parallel : int
        Cables in parallel [-].

    Examples
    --------
    >>> parallel_text(1), parallel_text(3)
    ('', '3x')
    """
    return f"{parallel}x" if parallel > 1 else ""


def cable_text(cores: int, csa_mm2: float, conductor: str, insulation: str, parallel: int = 1,
               size_label: str = "", form: str = "schedule") -> str:
    """The cable in one line, e.g. ``"2x 4C 240 mm² Cu/XLPE"``.

    Parameters
    ----------
    cores : int
        Cores of one cable [-].
    csa_mm2 : float
        Conductor cross-section [mm²].
    conductor, insulation : str
        ``"Cu"``/``"Al"`` and ``"XLPE"``/``"PVC"`` (contract.md, schedule columns).
    parallel : int
        Cables in parallel [-]; more than one leads the text (``"2x "``).
    size_label : str
        The rule set's size name (see :func:`size_text`).
    form : str
        ``"schedule"`` or ``"label"`` (:data:`CABLE_FORMS`).

    Examples
    --------
    >>> cable_text(4, 240.0, "Cu", "XLPE", 2)
    '2x 4C 240 mm² Cu/XLPE'
    >>> cable_text(3, 13.3, "Cu", "XLPE", size_label="6 AWG")
    '3C 6 AWG Cu/XLPE'
    >>> cable_text(4, 70.0, "Cu", "XLPE", form="label")
    '4x70 mm² Cu/XLPE'
    """
    body = CABLE_FORMS[form].format(cores=cores, size=size_text(csa_mm2, size_label))
    lead = parallel_text(parallel)
    return f"{lead + ' ' if lead else ''}{body} {conductor}/{insulation}"


def reduced_pe_mm2(pe_mm2: float | None, phase_mm2: float | None) -> float | None:
    """The protective conductor [mm²] when it is smaller than the phase conductors, else ``None``.

    IEC 60364-5-54:2011 Table 54.2 allows a reduced one; a full-size one is not
    written apart.

    Parameters
    ----------
    pe_mm2 : float or None
        Protective conductor cross-section [mm²].
    phase_mm2 : float or None
        Phase conductor cross-section [mm²].

    Examples
    --------
    >>> reduced_pe_mm2(35.0, 70.0), reduced_pe_mm2(16.0, 16.0), reduced_pe_mm2(None, 70.0)
    (35.0, None, None)
    """
    if pe_mm2 is None or phase_mm2 is None or float(pe_mm2) >= float(phase_mm2):
        return None
    return pe_mm2


def pe_text(pe_mm2: float | None, phase_mm2: float | None, form: str = "schedule") -> str:
    """A reduced protective conductor: ``"35 mm²"`` (schedule), ``"PE35"`` (label); "" otherwise.

    Parameters
    ----------
    pe_mm2, phase_mm2 : float or None
        Protective and phase conductor cross-sections [mm²].
    form : str
        ``"schedule"`` or ``"label"``.

    Examples
    --------
    >>> pe_text(35.0, 70.0), pe_text(35.0, 70.0, "label"), pe_text(70.0, 70.0)
    ('35 mm²', 'PE35', '')
    """
    pe = reduced_pe_mm2(pe_mm2, phase_mm2)
    if pe is None:
        return ""
    return f"PE{float(pe):g}" if form == "label" else f"{pe:g} mm²"
