"""Current-carrying capacities of IEC 60364-5-52:2009 Annex B as data.

Tables B.52.2 to B.52.5 (reference methods A1, A2, B1, B2, C, D1, D2) and
B.52.10 to B.52.13 (methods E, F, G), copper and aluminium, PVC and XLPE/EPR,
stored exactly as printed (``None`` where the table prints no value), with a
lookup :func:`tabulated_capacity` and :func:`sizes_for`.

Reference conditions (IEC 60364-5-52:2009, Annex B): ambient air 30 °C,
ground 20 °C, soil thermal resistivity 2.5 K·m/W, depth 0.7 m; conductor
temperature 70 °C (PVC) or 90 °C (XLPE/EPR).

Column keys for methods E, F and G (Tables B.52.10 to B.52.13):

=============  ================  =====================================================
key            loaded cond.      column of the printed table
=============  ================  =====================================================
``"E"``        2 or 3            multi-core cable in free air (columns 2 and 3)
``"F"``        2                 single-core cables touching, flat (column 4)
``"F"``        3                 single-core cables touching, trefoil (column 5)
``"F_flat"``   3                 single-core cables touching, flat (column 6)
``"G"``        3                 single-core cables spaced, flat horizontal (column 7)
``"G_vertical"`` 3               single-core cables spaced, flat vertical (column 8)
=============  ================  =====================================================

Where the values come from
--------------------------
No copy of the standard itself was available.  Values were copied from
public reproductions and cross-checked cell by cell (see ``provenance`` of each
constant and tests/test_capacity_tables.py):

* B.52.2 to B.52.5: two independent public reproductions of
  IEC 60364-5-52:2009 Annex B (a row-wise copy of all four tables, copper and
  aluminium; a column-wise copy of the same).  They differ in two cells, both
  settled here: B.52.4 copper A1 240 mm² (286, the other copy's 266 breaks the
  monotony of the column) and B.52.5 aluminium D2 (one copy repeats the D1
  column; the copy with distinct values is used).  Aluminium D2 has no value
  below 16 mm² in one copy; the other fills 6 and 10 mm² with the D1 values,
  taken here as a copying error (no value, so no lookup).  Copper
  B.52.2 to B.52.5 was also checked against a third public copy.
* B.52.10 to B.52.13: a public reproduction of TCVN 7447-5-52:2010, the
  Vietnamese identical adoption of IEC 60364-5-52:2009.  Copper (B.52.10,
  B.52.12) cross-checked against the equivalent copper tables of NBR 5410
  (methods E, F, G); aluminium (B.52.11, B.52.13) column "E" three loaded
  conductors cross-checked against a second public copy, the other aluminium
  columns rest on the single copy.

References
----------
.. [1] IEC 60364-5-52:2009, Low-voltage electrical installations - Part 5-52:
   Selection and erection of electrical equipment - Wiring systems, Annex B,
   Tables B.52.2 to B.52.5 and B.52.10 to B.52.13.
"""

from __future__ import annotations

import difflib
from dataclasses import dataclass
from typing import cast

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

__all__ = [
    "CapacityRow",
    "canonical_method",
    "CapacityTable",
    "Tabulated",
    "B_52_2_CU",
    "B_52_2_AL",
    "B_52_3_CU",
    "B_52_3_AL",
    "B_52_4_CU",
    "B_52_4_AL",
    "B_52_5_CU",
    "B_52_5_AL",
    "B_52_10",
    "B_52_11",
    "B_52_12",
    "B_52_13",
    "ALL_TABLES",
    "METHODS",
    "CONDUCTORS",
    "INSULATIONS",
    "tabulated_capacity",
    "sizes_for",
]

_STANDARD = "IEC 60364-5-52"
_EDITION = "2009"


@dataclass(frozen=True)
class CapacityRow:
    """One printed row: a cross-section and the current of every column.

    Attributes
    ----------
    csa_mm2 : float
        Nominal cross-section [mm²].
    amps : tuple of float or None
        Current-carrying capacity of each column [A]; ``None`` where the table
        prints no value.
    """

    csa_mm2: float
    amps: tuple[float | None, ...]


@dataclass(frozen=True)
class CapacityTable:
    """One current-carrying capacity table of IEC 60364-5-52:2009 Annex B.

    Attributes
    ----------
    table : str
        Table number, e.g. ``"B.52.5"``.
    insulation : str
        ``"PVC"`` or ``"XLPE"`` (XLPE/EPR, thermosetting).
    conductor : str
        ``"Cu"`` or ``"Al"``.
    loaded_conductors : int or None
        Loaded conductors of the whole table (B.52.2 to B.52.5); ``None`` where
        it differs by column (B.52.10 to B.52.13, see ``column_loaded``).
    conductor_temp_c : int
        Maximum conductor temperature [°C]: 70 (PVC) or 90 (XLPE/EPR).
    reference_ambient_c : tuple of (str, float)
        Reference ambient per medium [°C]: air 30, ground 20.
    columns : tuple of str
        Method key of every column (see the module docstring).
    column_loaded : tuple of int
        Loaded conductors of every column.
    rows : tuple of CapacityRow
        Rows as printed, ascending cross-section.
    provenance : str
        Where the values were read (public copies) and how they were checked.
    standard, edition, unit : str
        ``"IEC 60364-5-52"``, ``"2009"``, ``"A"``.
    """

    table: str
    insulation: str
    conductor: str
    loaded_conductors: int | None
    conductor_temp_c: int
    reference_ambient_c: tuple[tuple[str, float], ...]
    columns: tuple[str, ...]
    column_loaded: tuple[int, ...]
    rows: tuple[CapacityRow, ...]
    provenance: str
    standard: str = _STANDARD
    edition: str = _EDITION
    unit: str = "A"

    @property
    def source(self) -> str:
        """Citation, e.g. ``"IEC 60364-5-52:2009 Table B.52.5"``."""
        return f"{self.standard}:{self.edition} Table {self.table}"


@dataclass(frozen=True)
class Tabulated:
    """A current read from a table.

    Attributes
    ----------
    current_a : float
        Tabulated current-carrying capacity [A].
    source : str
        Standard, edition, table and column, e.g.
        ``"IEC 60364-5-52:2009 Table B.52.5, column E"``.
    detail : str
        The row and column read, in words.
    """

    current_a: float
    source: str
    detail: str


_REF_AMBIENT = (("air", 30.0), ("ground", 20.0))
_ABCD = ("A1", "A2", "B1", "B2", "C", "D1", "D2")
_EFG = ("E", "E", "F", "F", "F_flat", "G", "G_vertical")
_EFG_LOADED = (2, 3, 2, 3, 3, 3, 3)

_PROV_ABCD = (
    "Two public reproductions of IEC 60364-5-52:2009 Annex B compared cell by cell; "
    "all cells agree except where noted in the module docstring."
)
_PROV_EFG_CU = (
    "Public reproduction of TCVN 7447-5-52:2010 (identical adoption of "
    "IEC 60364-5-52:2009), cross-checked cell by cell against the equivalent "
    "copper tables of NBR 5410 (methods E, F, G)."
)
_PROV_EFG_AL = (
    "Public reproduction of TCVN 7447-5-52:2010 (identical adoption of "
    "IEC 60364-5-52:2009); column E three loaded conductors cross-checked against a "
    "second public copy, the other columns rest on this single copy."
)

_: None = None  # no value printed


def _rows(data: tuple[tuple[float | None, ...], ...]) -> tuple[CapacityRow, ...]:
    # the first cell of a row is its size, always printed
    return tuple(CapacityRow(float(cast(float, r[0])), tuple(r[1:])) for r in data)


def _abcd(table: str, ins: str, cond: str, loaded: int,
          data: tuple[tuple[float | None, ...], ...]) -> CapacityTable:
    return CapacityTable(
        table=table,
        insulation=ins,
        conductor=cond,
        loaded_conductors=loaded,
        conductor_temp_c=70 if ins == "PVC" else 90,
        reference_ambient_c=_REF_AMBIENT,
        columns=_ABCD,
        column_loaded=(loaded,) * len(_ABCD),
        rows=_rows(data),
        provenance=_PROV_ABCD,
    )


def _efg(table: str, ins: str, cond: str, data: tuple[tuple[float | None, ...], ...]) -> CapacityTable:
    return CapacityTable(
        table=table,
        insulation=ins,
        conductor=cond,
        loaded_conductors=None,
        conductor_temp_c=70 if ins == "PVC" else 90,
        reference_ambient_c=_REF_AMBIENT,
        columns=_EFG,
        column_loaded=_EFG_LOADED,
        rows=_rows(data),
        provenance=_PROV_EFG_CU if cond == "Cu" else _PROV_EFG_AL,
    )


# fmt: off
# IEC 60364-5-52:2009 Table B.52.2: PVC, two loaded conductors, copper or aluminium,
# conductor 70 °C, ambient 30 °C in air, 20 °C in ground.
#        csa    A1    A2    B1    B2    C     D1    D2
B_52_2_CU = _abcd("B.52.2", "PVC", "Cu", 2, (
    (1.5,  14.5, 14,   17.5, 16.5, 19.5, 22,  22),
    (2.5,  19.5, 18.5, 24,   23,   27,   29,  28),
    (4,    26,   25,   32,   30,   36,   37,  38),
    (6,    34,   32,   41,   38,   46,   46,  48),
    (10,   46,   43,   57,   52,   63,   60,  64),
    (16,   61,   57,   76,   69,   85,   78,  83),
    (25,   80,   75,   101,  90,   112,  99,  110),
    (35,   99,   92,   125,  111,  138,  119, 132),
    (50,   119,  110,  151,  133,  168,  140, 156),
    (70,   151,  139,  192,  168,  213,  173, 192),
    (95,   182,  167,  232,  201,  258,  204, 230),
    (120,  210,  192,  269,  232,  299,  231, 261),
    (150,  240,  219,  300,  258,  344,  261, 293),
    (185,  273,  248,  341,  294,  392,  292, 331),
    (240,  321,  291,  400,  344,  461,  336, 382),
    (300,  367,  334,  458,  394,  530,  379, 427),
))
B_52_2_AL = _abcd("B.52.2", "PVC", "Al", 2, (
    (2.5,  15,   14.5, 18.5, 17.5, 21,   22,  _),
    (4,    20,   19.5, 25,   24,   28,   29,  _),
    (6,    26,   25,   32,   30,   36,   36,  _),
    (10,   36,   33,   44,   41,   49,   47,  _),
    (16,   48,   44,   60,   54,   66,   61,  63),
    (25,   63,   58,   79,   71,   83,   77,  82),
    (35,   77,   71,   97,   86,   103,  93,  98),
    (50,   93,   86,   118,  104,  125,  109, 117),
    (70,   118,  108,  150,  131,  160,  135, 145),
    (95,   142,  130,  181,  157,  195,  159, 173),
    (120,  164,  150,  210,  181,  226,  180, 200),
    (150,  189,  172,  234,  201,  261,  204, 224),
    (185,  215,  195,  266,  230,  298,  228, 255),
    (240,  252,  229,  312,  269,  352,  262, 298),
    (300,  289,  263,  358,  308,  406,  296, 336),
))

# IEC 60364-5-52:2009 Table B.52.3: XLPE/EPR, two loaded conductors, 90 °C.
B_52_3_CU = _abcd("B.52.3", "XLPE", "Cu", 2, (
    (1.5,  19,   18.5, 23,   22,   24,   25,  27),
    (2.5,  26,   25,   31,   30,   33,   33,  35),
    (4,    35,   33,   42,   40,   45,   43,  46),
    (6,    45,   42,   54,   51,   58,   53,  58),
    (10,   61,   57,   75,   69,   80,   71,  77),
    (16,   81,   76,   100,  91,   107,  91,  100),
    (25,   106,  99,   133,  119,  138,  116, 129),
    (35,   131,  121,  164,  146,  171,  139, 155),
    (50,   158,  145,  198,  175,  209,  164, 183),
    (70,   200,  183,  253,  221,  269,  203, 225),
    (95,   241,  220,  306,  265,  328,  239, 270),
    (120,  278,  253,  354,  305,  382,  271, 306),
    (150,  318,  290,  393,  334,  441,  306, 343),
    (185,  362,  329,  449,  384,  506,  343, 387),
    (240,  424,  386,  528,  459,  599,  395, 448),
    (300,  486,  442,  603,  532,  693,  446, 502),
))
B_52_3_AL = _abcd("B.52.3", "XLPE", "Al", 2, (
    (2.5,  20,   19.5, 25,   23,   26,   26,  _),
    (4,    27,   26,   33,   31,   35,   33,  _),
    (6,    35,   33,   43,   40,   45,   42,  _),
    (10,   48,   45,   59,   54,   62,   55,  _),
    (16,   64,   60,   79,   72,   84,   71,  76),
    (25,   84,   78,   105,  94,   101,  90,  98),
    (35,   103,  96,   130,  115,  126,  108, 117),
    (50,   125,  115,  157,  138,  154,  128, 139),
    (70,   158,  145,  200,  175,  198,  158, 170),
    (95,   191,  175,  242,  210,  241,  186, 204),
    (120,  220,  201,  281,  242,  280,  211, 233),
    (150,  253,  230,  307,  261,  324,  238, 261),
    (185,  288,  262,  351,  300,  371,  267, 296),
    (240,  338,  307,  412,  358,  439,  307, 343),
    (300,  387,  352,  471,  415,  508,  346, 386),
))

# IEC 60364-5-52:2009 Table B.52.4: PVC, three loaded conductors, 70 °C.
B_52_4_CU = _abcd("B.52.4", "PVC", "Cu", 3, (
    (1.5,  13.5, 13,   15.5, 15,   17.5, 18,  19),
    (2.5,  18,   17.5, 21,   20,   24,   24,  24),
    (4,    24,   23,   28,   27,   32,   30,  33),
    (6,    31,   29,   36,   34,   41,   38,  41),
    (10,   42,   39,   50,   46,   57,   50,  54),
    (16,   56,   52,   68,   62,   76,   64,  70),
    (25,   73,   68,   89,   80,   96,   82,  92),
    (35,   89,   83,   110,  99,   119,  98,  110),
    (50,   108,  99,   134,  118,  144,  116, 130),
    (70,   136,  125,  171,  149,  184,  143, 162),
    (95,   164,  150,  207,  179,  223,  169, 193),
    (120,  188,  172,  239,  206,  259,  192, 220),
    (150,  216,  196,  262,  225,  299,  217, 246),
    (185,  245,  223,  296,  255,  341,  243, 278),
    (240,  286,  261,  346,  297,  403,  280, 320),
    (300,  328,  298,  394,  339,  464,  316, 359),
))
B_52_4_AL = _abcd("B.52.4", "PVC", "Al", 3, (
    (2.5,  14,   13.5, 16.5, 15.5, 18.5, 18.5, _),
    (4,    18.5, 17.5, 22,   21,   25,   24,  _),
    (6,    24,   23,   28,   27,   32,   30,  _),
    (10,   32,   31,   39,   36,   44,   39,  _),
    (16,   43,   41,   53,   48,   59,   50,  53),
    (25,   57,   53,   70,   62,   73,   64,  69),
    (35,   70,   65,   86,   77,   90,   77,  83),
    (50,   84,   78,   104,  92,   110,  91,  99),
    (70,   107,  98,   133,  116,  140,  112, 122),
    (95,   129,  118,  161,  139,  170,  132, 148),
    (120,  149,  135,  186,  160,  197,  150, 169),
    (150,  170,  155,  204,  176,  227,  169, 189),
    (185,  194,  176,  230,  199,  259,  190, 214),
    (240,  227,  207,  269,  232,  305,  218, 250),
    (300,  261,  237,  306,  265,  351,  247, 282),
))

# IEC 60364-5-52:2009 Table B.52.5: XLPE/EPR, three loaded conductors, 90 °C.
B_52_5_CU = _abcd("B.52.5", "XLPE", "Cu", 3, (
    (1.5,  17,   16.5, 20,   19.5, 22,   21,  23),
    (2.5,  23,   22,   28,   26,   30,   28,  30),
    (4,    31,   30,   37,   35,   40,   36,  39),
    (6,    40,   38,   48,   44,   52,   44,  49),
    (10,   54,   51,   66,   60,   71,   58,  65),
    (16,   73,   68,   88,   80,   96,   75,  84),
    (25,   95,   89,   117,  105,  119,  96,  107),
    (35,   117,  109,  144,  128,  147,  115, 129),
    (50,   141,  130,  175,  154,  179,  135, 153),
    (70,   179,  164,  222,  194,  229,  167, 188),
    (95,   216,  197,  269,  233,  278,  197, 226),
    (120,  249,  227,  312,  268,  322,  223, 257),
    (150,  285,  259,  342,  300,  371,  251, 287),
    (185,  324,  295,  384,  340,  424,  281, 324),
    (240,  380,  346,  450,  398,  500,  324, 375),
    (300,  435,  396,  514,  455,  576,  365, 419),
))
B_52_5_AL = _abcd("B.52.5", "XLPE", "Al", 3, (
    (2.5,  19,   18,   22,   21,   24,   22,  _),
    (4,    25,   24,   29,   28,   32,   28,  _),
    (6,    32,   31,   38,   35,   41,   35,  _),
    (10,   44,   41,   52,   48,   57,   46,  _),
    (16,   58,   55,   71,   64,   76,   59,  64),
    (25,   76,   71,   93,   84,   90,   75,  82),
    (35,   94,   87,   116,  103,  112,  90,  98),
    (50,   113,  104,  140,  124,  136,  106, 117),
    (70,   142,  131,  179,  156,  174,  130, 144),
    (95,   171,  157,  217,  188,  211,  154, 172),
    (120,  197,  180,  251,  216,  245,  174, 197),
    (150,  226,  206,  267,  240,  283,  197, 220),
    (185,  256,  233,  300,  272,  323,  220, 250),
    (240,  300,  273,  351,  318,  382,  253, 290),
    (300,  344,  313,  402,  364,  440,  286, 326),
))

# IEC 60364-5-52:2009 Tables B.52.10 to B.52.13: methods E, F, G.
# Columns: E 2 loaded, E 3 loaded, F 2 loaded touching, F 3 loaded trefoil,
#          F 3 loaded flat touching, G 3 loaded spaced horizontal, G 3 loaded spaced vertical.
# Table B.52.10: PVC, copper, 70 °C, ambient 30 °C.
B_52_10 = _efg("B.52.10", "PVC", "Cu", (
    (1.5,  22,   18.5, _,    _,    _,    _,    _),
    (2.5,  30,   25,   _,    _,    _,    _,    _),
    (4,    40,   34,   _,    _,    _,    _,    _),
    (6,    51,   43,   _,    _,    _,    _,    _),
    (10,   70,   60,   _,    _,    _,    _,    _),
    (16,   94,   80,   _,    _,    _,    _,    _),
    (25,   119,  101,  131,  110,  114,  146,  130),
    (35,   148,  126,  162,  137,  143,  181,  162),
    (50,   180,  153,  196,  167,  174,  219,  197),
    (70,   232,  196,  251,  216,  225,  281,  254),
    (95,   282,  238,  304,  264,  275,  341,  311),
    (120,  328,  276,  352,  308,  321,  396,  362),
    (150,  379,  319,  406,  356,  372,  456,  419),
    (185,  434,  364,  463,  409,  427,  521,  480),
    (240,  514,  430,  546,  485,  507,  615,  569),
    (300,  593,  497,  629,  561,  587,  709,  659),
    (400,  _,    _,    754,  656,  689,  852,  795),
    (500,  _,    _,    868,  749,  789,  982,  920),
    (630,  _,    _,    1005, 855,  905,  1138, 1070),
))
# Table B.52.11: PVC, aluminium, 70 °C.
B_52_11 = _efg("B.52.11", "PVC", "Al", (
    (2.5,  23,   19.5, _,    _,    _,    _,    _),
    (4,    31,   26,   _,    _,    _,    _,    _),
    (6,    39,   33,   _,    _,    _,    _,    _),
    (10,   54,   46,   _,    _,    _,    _,    _),
    (16,   73,   61,   _,    _,    _,    _,    _),
    (25,   89,   78,   98,   84,   87,   112,  99),
    (35,   111,  96,   122,  105,  109,  139,  124),
    (50,   135,  117,  149,  128,  133,  169,  152),
    (70,   173,  150,  192,  166,  173,  217,  196),
    (95,   210,  183,  235,  203,  212,  265,  241),
    (120,  244,  212,  273,  237,  247,  308,  282),
    (150,  282,  245,  316,  274,  287,  356,  327),
    (185,  322,  280,  363,  315,  330,  407,  376),
    (240,  380,  330,  430,  375,  392,  482,  447),
    (300,  439,  381,  497,  434,  455,  557,  519),
    (400,  _,    _,    600,  526,  552,  671,  629),
    (500,  _,    _,    694,  610,  640,  775,  730),
    (630,  _,    _,    808,  711,  746,  900,  852),
))
# Table B.52.12: XLPE/EPR, copper, 90 °C.
B_52_12 = _efg("B.52.12", "XLPE", "Cu", (
    (1.5,  26,   23,   _,    _,    _,    _,    _),
    (2.5,  36,   32,   _,    _,    _,    _,    _),
    (4,    49,   42,   _,    _,    _,    _,    _),
    (6,    63,   54,   _,    _,    _,    _,    _),
    (10,   86,   75,   _,    _,    _,    _,    _),
    (16,   115,  100,  _,    _,    _,    _,    _),
    (25,   149,  127,  161,  135,  141,  182,  161),
    (35,   185,  158,  200,  169,  176,  226,  201),
    (50,   225,  192,  242,  207,  216,  275,  246),
    (70,   289,  246,  310,  268,  279,  353,  318),
    (95,   352,  298,  377,  328,  342,  430,  389),
    (120,  410,  346,  437,  383,  400,  500,  454),
    (150,  473,  399,  504,  444,  464,  577,  527),
    (185,  542,  456,  575,  510,  533,  661,  605),
    (240,  641,  538,  679,  607,  634,  781,  719),
    (300,  741,  621,  783,  703,  736,  902,  833),
    (400,  _,    _,    940,  823,  868,  1085, 1008),
    (500,  _,    _,    1083, 946,  998,  1253, 1169),
    (630,  _,    _,    1254, 1088, 1151, 1454, 1362),
))
# Table B.52.13: XLPE/EPR, aluminium, 90 °C.
B_52_13 = _efg("B.52.13", "XLPE", "Al", (
    (2.5,  28,   24,   _,    _,    _,    _,    _),
    (4,    38,   32,   _,    _,    _,    _,    _),
    (6,    49,   42,   _,    _,    _,    _,    _),
    (10,   67,   58,   _,    _,    _,    _,    _),
    (16,   91,   77,   _,    _,    _,    _,    _),
    (25,   108,  97,   121,  103,  107,  138,  122),
    (35,   135,  120,  150,  129,  135,  172,  153),
    (50,   164,  146,  184,  159,  165,  210,  188),
    (70,   211,  187,  237,  206,  215,  271,  244),
    (95,   257,  227,  289,  253,  264,  332,  300),
    (120,  300,  263,  337,  296,  308,  387,  351),
    (150,  346,  304,  389,  343,  358,  448,  408),
    (185,  397,  347,  447,  395,  413,  515,  470),
    (240,  470,  409,  530,  471,  492,  611,  561),
    (300,  543,  471,  613,  547,  571,  708,  652),
    (400,  _,    _,    740,  663,  694,  856,  792),
    (500,  _,    _,    856,  770,  806,  991,  921),
    (630,  _,    _,    996,  899,  942,  1154, 1077),
))
# fmt: on

#: Every table, in order of the standard.
ALL_TABLES: tuple[CapacityTable, ...] = (
    B_52_2_CU, B_52_2_AL, B_52_3_CU, B_52_3_AL, B_52_4_CU, B_52_4_AL,
    B_52_5_CU, B_52_5_AL, B_52_10, B_52_11, B_52_12, B_52_13,
)  # fmt: skip

#: Known method keys, conductor keys and insulation keys.
METHODS: tuple[str, ...] = _ABCD + ("E", "F", "F_flat", "G", "G_vertical")
CONDUCTORS: tuple[str, ...] = ("Cu", "Al")
INSULATIONS: tuple[str, ...] = ("PVC", "XLPE", "EPR")
_INSULATION_ALIAS = {"PVC": "PVC", "XLPE": "XLPE", "EPR": "XLPE"}

# Index built once at import: (method, conductor, insulation, loaded) -> (table, column)
_Key = tuple[str, str, str, int]
_INDEX: dict[_Key, tuple[CapacityTable, int]] = {}
_VALUES: dict[_Key, dict[float, float]] = {}
for _table in ALL_TABLES:
    for _col, (_method, _loaded) in enumerate(zip(_table.columns, _table.column_loaded, strict=True)):
        _key = (_method, _table.conductor, _table.insulation, _loaded)
        _INDEX[_key] = (_table, _col)
        _VALUES[_key] = {
            _row.csa_mm2: float(_amps)
            for _row in _table.rows
            if (_amps := _row.amps[_col]) is not None
        }
del _table, _col, _method, _loaded, _key, _amps


_METHOD_BY_UPPER = {m.upper(): m for m in METHODS}


def canonical_method(method: str) -> str:
    """A reference-method key as this module spells it, read case-insensitively.

    Parameters
    ----------
    method : str
        E.g. ``"e"``, ``"F_FLAT"``, ``"g_vertical"``.

    Returns
    -------
    str
        The key of :data:`METHODS` (``"F_flat"``); an unknown name is returned
        stripped and unchanged, for the lookup to reject with its message.

    Examples
    --------
    >>> canonical_method("F_FLAT"), canonical_method(" g_vertical ")
    ('F_flat', 'G_vertical')
    """
    text = str(method).strip()
    return _METHOD_BY_UPPER.get(text.upper(), text)


def _check_key(kind: str, value: str, known: tuple[str, ...]) -> None:
    if value not in known:
        lower = {k.lower(): k for k in known}
        close = [lower[c] for c in difflib.get_close_matches(str(value).lower(), lower, n=3)]
        hint = f"; did you mean {', '.join(repr(c) for c in close)}?" if close else ""
        raise UnknownKeyError(
            f"unknown {kind} {value!r} for IEC 60364-5-52:2009 Annex B capacity tables; "
            f"known: {', '.join(known)}{hint}", value=value
        )


def _resolve(method: str, conductor: str, insulation: str, loaded_conductors: int) -> _Key:
    _check_key("installation method", method, METHODS)
    _check_key("conductor", conductor, CONDUCTORS)
    _check_key("insulation", insulation, INSULATIONS)
    key = (method, conductor, _INSULATION_ALIAS[insulation], loaded_conductors)
    if key not in _INDEX:
        known = sorted({k[3] for k in _INDEX if k[0] == method})
        raise UnknownKeyError(
            f"IEC 60364-5-52:2009 Annex B has no column for method {method} with "
            f"{loaded_conductors} loaded conductors; known loaded conductors for "
            f"{method}: {', '.join(str(n) for n in known)}"
        )
    return key


def _column_label(table: CapacityTable, col: int) -> str:
    return f"column {table.columns[col]} ({table.column_loaded[col]} loaded conductors)"


def sizes_for(
    method: str, conductor: str, insulation: str, loaded_conductors: int
) -> tuple[float, ...]:
    """Cross-sections for which a column gives a value, ascending.

    Parameters
    ----------
    method : str
        Reference method key: A1, A2, B1, B2, C, D1, D2, E, F, F_flat, G, G_vertical.
    conductor : str
        ``"Cu"`` or ``"Al"``.
    insulation : str
        ``"PVC"`` or ``"XLPE"`` (``"EPR"`` reads the XLPE/EPR tables).
    loaded_conductors : int
        2 or 3 (methods F_flat, G and G_vertical only 3).

    Returns
    -------
    tuple of float
        Cross-sections [mm²].

    Raises
    ------
    UnknownKeyError
        Unknown method, conductor or insulation, or no such column.

    Examples
    --------
    >>> sizes_for("D2", "Al", "PVC", 2)[:3]
    (16.0, 25.0, 35.0)

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Tables B.52.2 to B.52.13.
    """
    key = _resolve(method, conductor, insulation, loaded_conductors)
    return tuple(sorted(_VALUES[key]))


def tabulated_capacity(
    method: str, conductor: str, insulation: str, loaded_conductors: int, csa_mm2: float
) -> Tabulated:
    """Current-carrying capacity printed in IEC 60364-5-52:2009 Annex B.

    Reads one cell of Tables B.52.2 to B.52.5 (methods A1 to D2) or B.52.10 to
    B.52.13 (methods E, F, G) at the reference conditions of the table; no
    correction factor is applied and nothing is interpolated.

    Parameters
    ----------
    method : str
        Reference method key: A1, A2, B1, B2, C, D1, D2, E, F, F_flat, G,
        G_vertical (see the module docstring for E/F/G).
    conductor : str
        ``"Cu"`` or ``"Al"``.
    insulation : str
        ``"PVC"`` (70 °C) or ``"XLPE"`` (90 °C; ``"EPR"`` reads the same tables).
    loaded_conductors : int
        2 or 3.
    csa_mm2 : float
        Nominal cross-section [mm²]; must be a tabulated size.

    Returns
    -------
    Tabulated
        The current [A], its source and the row and column read.

    Raises
    ------
    UnknownKeyError
        Unknown method, conductor or insulation, or no such column.
    OutOfRangeError
        The cross-section is not tabulated in that column.

    Examples
    --------
    >>> t = tabulated_capacity("E", "Cu", "XLPE", 3, 70)
    >>> t.current_a, t.source
    (246.0, 'IEC 60364-5-52:2009 Table B.52.12, column E')

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Tables B.52.2 to B.52.13.
    """
    key = _resolve(method, conductor, insulation, loaded_conductors)
    table, col = _INDEX[key]
    values = _VALUES[key]
    csa = float(csa_mm2)
    amps = values.get(csa)
    if amps is None:
        sizes = sorted(values)
        raise OutOfRangeError(
            f"cross-section {csa_mm2:g} mm² has no value in {table.source}, "
            f"{_column_label(table, col)}, {conductor}/{insulation}; tabulated sizes run "
            f"{sizes[0]:g} to {sizes[-1]:g} mm²: {', '.join(f'{s:g}' for s in sizes)}. "
            "Choose a tabulated size.", value=csa_mm2
        )
    return Tabulated(
        current_a=amps,
        source=f"{table.source}, column {method}",
        detail=(
            f"{csa:g} mm² {conductor}/{table.insulation}, {_column_label(table, col)}, "
            f"conductor {table.conductor_temp_c} °C"
        ),
    )
