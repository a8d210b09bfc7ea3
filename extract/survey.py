"""What a drawing holds, for writing its config: layers, blocks, texts, units, extents.

``cablewright layers DRAWING`` (contract.md, Extensions) shows every layer with its
entity counts by type, its total line length and a suggested containment where the
layer's name suggests one; every block with its attribute names and insert count;
the texts that could serve as equipment tags; the units, the route extents and
whether they are plausible.  :func:`starting_config` turns the suggestions into a
TOML config that ``size`` accepts.

The containment words are the trade's usual names in English, German, French,
Spanish, Italian, Dutch and Portuguese (common practice, from memory); each maps to
one of our containments and its IEC 60364-5-52 reference method as contract.md's
layer table fixes them (:data:`~cablewright.extract.model.DEFAULT_ROUTE_LAYERS`).
"""

from __future__ import annotations

import json
import os
import re
import unicodedata
from collections import Counter
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import TYPE_CHECKING, cast

from cablewright.core.errors import DrawingReadError

from .dxf_reader import DxfContent, _load, _walk_layout, _Walker
from .dxf_tags import first_word, looks_like_tag, text_anchor
from .dxf_units import header_code
from .model import DEFAULT_ROUTE_LAYERS, DrawingConfig
from .units import (
    INSUNITS,
    UNIT_TO_M,
    Extents,
    ScaleCheck,
    check_scale,
    extents,
    rank_units,
    unit_name,
)

if TYPE_CHECKING:
    from ezdxf.entities import Insert, MText

__all__ = [
    "CONTAINMENT_WORDS",
    "METHOD_OF",
    "LayerSuggestion",
    "LayerSurvey",
    "BlockSurvey",
    "TagText",
    "Survey",
    "suggest_containment",
    "survey_drawing",
    "starting_config",
]

#: Reference method of each containment, from contract.md's layer table.
METHOD_OF = {kind: method for kind, method in DEFAULT_ROUTE_LAYERS.values()}

#: Words suggesting a containment -> (containment, may sit inside a compound word).
#: Compounds are German and Dutch words written as one ("Kabelrinne").  Common trade
#: terms, from memory.
CONTAINMENT_WORDS: dict[str, tuple[str, bool]] = {
    # cable tray, perforated, in air (E)
    "tray": ("tray", False), "cabletray": ("tray", True),
    "trasse": ("tray", True), "rinne": ("tray", True), "pritsche": ("tray", True),  # de
    "kabelgoot": ("tray", True), "goot": ("tray", False),  # nl
    "chemin de cables": ("tray", False), "chemin de cable": ("tray", False), "dalle": ("tray", False),  # fr
    "bandeja": ("tray", False),  # es, pt
    "passerella": ("tray", False), "passerelle": ("tray", False),  # it, fr
    "eletrocalha": ("tray", False),  # pt
    # cable ladder, in air (E)
    "ladder": ("ladder", True), "kabelleiter": ("ladder", True), "leiter": ("ladder", False),  # en, de, nl
    "echelle": ("ladder", False),  # fr (échelle à câbles)
    "escalera": ("ladder", False), "escalerilla": ("ladder", False),  # es
    "passerella a scala": ("ladder", False), "scala portacavi": ("ladder", False),  # it
    "kabelstege": ("ladder", True),  # sv, no
    # conduit or trunking on a wall (B2)
    "conduit": ("conduit", False), "trunking": ("conduit", False), "raceway": ("conduit", False),
    "tube": ("conduit", False),  # en, fr
    "rohr": ("conduit", True), "leerrohr": ("conduit", True), "kanal": ("conduit", True),  # de
    "gaine": ("conduit", False), "goulotte": ("conduit", False),  # fr
    "tubo": ("conduit", False), "tubi": ("conduit", False), "canaleta": ("conduit", False),  # es, it
    "canalina": ("conduit", False), "canaletta": ("conduit", False), "guaina": ("conduit", False),  # it
    "buis": ("conduit", False), "kabelkanaal": ("conduit", True),  # nl
    "eletroduto": ("conduit", False),  # pt
    # clipped direct to a wall (C)
    "clipped": ("clipped", False), "clip": ("clipped", False), "schelle": ("clipped", True),
    # ducts in the ground (D1)
    "duct": ("duct", False), "ductbank": ("duct", False),
    "schutzrohr": ("duct", True), "kabelschutzrohr": ("duct", True), "erdrohr": ("duct", True),  # de
    "fourreau": ("duct", False),  # fr
    "tubo enterrado": ("duct", False), "ducto": ("duct", False),  # es
    "cavidotto": ("duct", False),  # it
    "mantelbuis": ("duct", True),  # nl
    # direct in the ground (D2)
    "buried": ("buried", False), "trench": ("buried", False), "underground": ("buried", False),
    "erdkabel": ("buried", True), "erdverlegt": ("buried", True), "graben": ("buried", True),  # de
    "tranchee": ("buried", False), "enterre": ("buried", False), "pleine terre": ("buried", False),  # fr
    "zanja": ("buried", False), "enterrado": ("buried", False),  # es
    "trincea": ("buried", False), "interrato": ("buried", False), "scavo": ("buried", False),  # it
    "sleuf": ("buried", False),  # nl
}

def _fold(text: str) -> str:
    """Lower case, accents removed, ß as ss: ``"Tranchée"`` -> ``"tranchee"``."""
    text = text.replace("ß", "ss").replace("ẞ", "ss")
    decomposed = unicodedata.normalize("NFKD", text)
    return "".join(c for c in decomposed if not unicodedata.combining(c)).lower()


def _tokens(name: str) -> list[str]:
    spaced = re.sub(r"(?<=[a-z])(?=[A-Z])", " ", name)  # camelCase -> camel Case
    return [t for t in re.split(r"[^0-9a-z]+", _fold(spaced)) if t]


@dataclass(frozen=True)
class LayerSuggestion:
    """A containment suggested by a layer's name.

    Attributes
    ----------
    containment : str
        One of our containments (tray, ladder, conduit, clipped, duct, buried).
    method : str
        IEC 60364-5-52 reference method for a multi-core cable (contract.md layer table).
    word : str
        The word of the name that suggested it.
    """

    containment: str
    method: str
    word: str


def suggest_containment(layer: str) -> LayerSuggestion | None:
    """The containment a layer's name suggests, or None.

    The longest matching word wins ("Kabelschutzrohr" is a duct in the ground,
    not a conduit).

    Examples
    --------
    >>> suggest_containment("E-Kabelrinne").containment, suggest_containment("Tranchée BT").method
    ('tray', 'D2')
    >>> suggest_containment("CONDUCTORS") is None
    True
    """
    tokens = _tokens(layer)
    joined = " " + " ".join(tokens)
    best: tuple[int, str, str] | None = None
    for word, (kind, compound) in CONTAINMENT_WORDS.items():
        if " " in word:
            hit = (" " + word) in joined
        elif compound:
            hit = any(word in t for t in tokens)
        else:
            hit = any(t.startswith(word) for t in tokens)
        if hit and (best is None or len(word) > best[0]):
            best = (len(word), word, kind)
    if best is None:
        return None
    return LayerSuggestion(best[2], METHOD_OF[best[2]], best[1])


@dataclass
class LayerSurvey:
    """One layer: entity counts by type, line length, suggested containment."""

    name: str
    counts: Counter = field(default_factory=Counter)
    line_length: float = 0.0  # [drawing units]
    suggestion: LayerSuggestion | None = None
    route_kind: tuple[str, str] | None = None  # already a route layer by the config
    symbols: int = 0  # CIRCLE and POINT entities
    symbols_near_tag_text: int = 0


@dataclass
class BlockSurvey:
    """One block definition: attribute names (definitions and on inserts), inserts in model space."""

    name: str
    attributes: set[str] = field(default_factory=set)
    inserts: int = 0


@dataclass(frozen=True)
class TagText:
    """A TEXT or MTEXT whose first word reads as a tag."""

    word: str
    layer: str
    position: tuple[float, float, float]  # [drawing units]
    source_id: str


@dataclass
class Survey:
    """What :func:`survey_drawing` found (lengths in drawing units unless ``_m``)."""

    path: str
    header_code: int
    units: str | None
    units_source: str
    layers: dict[str, LayerSurvey]
    blocks: dict[str, BlockSurvey]
    tag_texts: list[TagText]
    tagged_inserts: int
    extents_m: Extents | None = None  # units.Extents, [m] (drawing units as m when unitless)
    scale: ScaleCheck | None = None
    likely_units: tuple[str, ...] = ()
    tag_attribute: str = "TAG"
    tag_like_attributes: Counter = field(default_factory=Counter)

    def suggested_tag_attribute(self) -> str | None:
        """When no insert carries the tag attribute: the attribute whose values read as tags most often."""
        if self.tagged_inserts or not self.tag_like_attributes:
            return None
        return self.tag_like_attributes.most_common(1)[0][0]

    @property
    def metres_per_unit(self) -> float | None:
        """Metres per drawing unit, None when unitless."""
        return UNIT_TO_M[self.units] if self.units else None

    def route_layers(self) -> list[LayerSurvey]:
        """Layers read as routes: by the config, or suggested by their name, holding lines."""
        return [layer for layer in self.layers.values()
                if (layer.route_kind or layer.suggestion) and layer.line_length > 0]

    def symbol_layers(self) -> list[str]:
        """Layers whose circles and points mostly have a tag-like text near them."""
        return sorted(layer.name for layer in self.layers.values()
                      if layer.symbols and not (layer.route_kind or layer.suggestion)
                      and 2 * layer.symbols_near_tag_text >= layer.symbols)

    def as_dict(self) -> dict[str, object]:
        """The JSON document of ``layers --json``."""
        k = self.metres_per_unit
        layers = []
        for layer in sorted(self.layers.values(), key=lambda x: x.name.lower()):
            entry: dict[str, object] = {
                "name": layer.name, "counts": dict(sorted(layer.counts.items())),
                "line_length": round(layer.line_length, 3),
                "line_length_m": round(layer.line_length * k, 3) if k else None,
                "route_layer": list(layer.route_kind) if layer.route_kind else None,
                "suggested": ({"containment": layer.suggestion.containment, "method": layer.suggestion.method,
                               "word": layer.suggestion.word} if layer.suggestion else None),
            }
            layers.append(entry)
        out: dict[str, object] = {
            "drawing": self.path,
            "units": {"insunits": self.header_code, "used": self.units, "source": self.units_source,
                      "likely": list(self.likely_units)},
            "layers": layers,
            "blocks": [{"name": b.name, "attributes": sorted(b.attributes), "inserts": b.inserts}
                       for b in sorted(self.blocks.values(), key=lambda x: x.name.lower())],
            "tag_texts": [{"text": t.word, "layer": t.layer, "position": [round(v, 3) for v in t.position],
                           "source_id": t.source_id} for t in self.tag_texts],
            "tagged_inserts": self.tagged_inserts,
            "suggested_tag_attribute": self.suggested_tag_attribute(),
            "symbol_layers": self.symbol_layers(),
        }
        if self.extents_m is not None:
            e = self.extents_m
            out["extents_m"] = {"min": [round(v, 3) for v in e.min_m], "max": [round(v, 3) for v in e.max_m],
                                "size": [round(v, 3) for v in e.size_m],
                                "median_piece_m": round(e.median_piece_m, 3)}
        if self.scale is not None:
            out["scale"] = {"plausible": self.scale.plausible, "note": self.scale.reason,
                            "likely_units": list(self.scale.likely_units)}
        return out


def _length(points) -> float:
    total = 0.0
    for a, b in zip(points, points[1:], strict=False):
        total += sum((float(x) - float(y)) ** 2 for x, y in zip(a, b, strict=False)) ** 0.5
    return total


def _all_lines(doc, path: Path, config: DrawingConfig, metres_per_unit: float) -> list:
    """Every line-like entity of model space (block contents exploded) as route pieces, [m].

    The drawing is walked as :func:`~cablewright.extract.dxf_reader.read_dxf` walks
    it, with every layer taken as a route layer, so that the lengths shown are
    the lengths ``size`` will read once the layer is in the config.
    """
    every_layer = replace(config, route_layers={}, extra_layer_patterns={"*": ("tray", "E")},
                          tags_from_text=False)
    content = DxfContent(path=str(path), units=config.units or "m")
    walker = _Walker(doc, path, every_layer, metres_per_unit, content, every_layer.tag_attribute.upper())
    _walk_layout(walker, iter(doc.modelspace()))
    return content.polylines


def survey_drawing(path: str | os.PathLike[str], config: DrawingConfig | None = None) -> Survey:
    """Survey a DXF drawing: layers, blocks, tag-like texts, units, extents.

    Parameters
    ----------
    path : str or path-like
        The ``.dxf`` drawing (only read).
    config : DrawingConfig, optional
        Route layers already known, units override, tag attribute, recover mode.

    Returns
    -------
    Survey

    Raises
    ------
    DrawingReadError
        The file cannot be read as DXF (as :func:`~cablewright.extract.dxf_reader.read_dxf`),
        or its config units are not known.
    """
    config = config or DrawingConfig()
    p = Path(path)
    if p.suffix.lower() != ".dxf":
        raise DrawingReadError(file=p, problem=f"layers reads a .dxf drawing, not {p.suffix or 'a file without suffix'}")
    doc, _ = _load(p, config)
    code = header_code(doc)
    units, source = INSUNITS.get(code, (None, 0.0))[0], "header"
    if config.units is not None:
        units = unit_name(str(config.units))
        if units is None:
            raise DrawingReadError(file=p, problem=f'units {config.units!r} from the config or --units are not known',
                                   fix="use mm, cm, dm, m, in, ft, ...")
        source = "config"
    elif units is None:
        source = "none"
    k = UNIT_TO_M[units] if units else 1.0
    tag_key = config.tag_attribute.upper()
    layers: dict[str, LayerSurvey] = {}

    def layer_of(name: str) -> LayerSurvey:
        key = name.upper()
        if key not in layers:
            layers[key] = LayerSurvey(name, suggestion=suggest_containment(name), route_kind=config.layer_kind(name))
        return layers[key]

    for entry in doc.layers:
        layer_of(entry.dxf.name)
    blocks: dict[str, BlockSurvey] = {}
    for block in doc.blocks:
        name = block.name
        if name.startswith("*"):  # layouts and anonymous blocks (dimensions, hatches)
            continue
        info = blocks.setdefault(name, BlockSurvey(name))
        info.attributes.update(e.dxf.tag.upper() for e in block if e.dxftype() == "ATTDEF")
    route_pieces: list = []
    other_pieces: list = []
    for piece in _all_lines(doc, p, config, k):  # block contents exploded, as read_dxf reads routes
        layer = layer_of(piece.layer)
        pts = [(x / k, y / k, z / k) for x, y, z in piece.points_m]
        layer.line_length += _length(pts)
        (route_pieces if (layer.route_kind or layer.suggestion) else other_pieces).append(piece.points_m)
    tag_texts: list[TagText] = []
    symbols: list[tuple[LayerSurvey, tuple[float, float]]] = []
    tagged = 0
    tag_like: Counter = Counter()
    for e in doc.modelspace():
        t = e.dxftype()
        layer = layer_of(e.dxf.layer)
        layer.counts[t] += 1
        if t == "INSERT":
            info = blocks.setdefault(e.dxf.name, BlockSurvey(e.dxf.name))
            info.inserts += 1
            names = {a.dxf.tag.upper(): a.dxf.text for a in cast("Insert", e).attribs}
            info.attributes.update(names)
            tagged += bool(names.get(tag_key, "").strip())
            tag_like.update(n for n, v in names.items() if n != tag_key and looks_like_tag(v.strip()))
        elif t in ("TEXT", "MTEXT"):
            word = first_word(str(cast("MText", e).plain_text()) if t == "MTEXT" else str(e.dxf.text))
            if looks_like_tag(word):
                tag_texts.append(TagText(word, e.dxf.layer, text_anchor(e), e.dxf.handle or ""))
        elif t in ("CIRCLE", "POINT"):
            c = e.dxf.center if t == "CIRCLE" else e.dxf.location
            layer.symbols += 1
            symbols.append((layer, (float(c[0]), float(c[1]))))
    if symbols and tag_texts:  # symbols with a tag-like text within tag_text_max_m (one indexed query)
        import shapely

        tree = shapely.STRtree(shapely.points([t.position[:2] for t in tag_texts]))
        found = tree.query(shapely.points([xy for _, xy in symbols]), predicate="dwithin",
                           distance=config.tag_text_max_m / k)
        for i in sorted(set(found[0].tolist())):
            symbols[i][0].symbols_near_tag_text += 1
    ext = extents(route_pieces or other_pieces)
    scale = check_scale(ext, units) if ext is not None and units else None
    likely: tuple[str, ...] = ()
    if ext is not None:
        if not units:
            likely = rank_units(ext.largest_plan_m, ext.median_piece_m)
        elif scale is not None and not scale.plausible:
            likely = scale.likely_units
    return Survey(str(p), code, units, source, layers, blocks, tag_texts, tagged, ext, scale, likely,
                  config.tag_attribute, tag_like)


def _toml(text: str) -> str:
    """A TOML basic string (JSON's escapes are TOML's)."""
    return json.dumps(text, ensure_ascii=False)


def starting_config(survey: Survey) -> str:
    """A starting TOML config from a survey's suggestions, for ``size --config``.

    Parameters
    ----------
    survey : Survey
        From :func:`survey_drawing`.

    Returns
    -------
    str
        TOML text: ``[drawing]`` units when the header gives none (or a scale
        that is not plausible), ``tags_from_text`` when no block carries the tag
        attribute but texts look like tags, and ``[drawing.route_layers]`` from
        the layer names.  Every line says why; the user checks each.
    """
    out = [
        f"# Starting config for {Path(survey.path).name}, written by 'cablewright layers'.",
        "# Each value is a suggestion from the layer names and the drawing's contents:",
        "# check it against the drawing before sizing.  Results are a design aid, to be",
        "# checked by a qualified person.  All keys: cablewright/default_config.toml.",
        "",
        "[drawing]",
    ]
    if survey.units_source == "none" and survey.likely_units:
        out.append(f"units = {_toml(survey.likely_units[0])}   # $INSUNITS is 0 (unitless); the routes' "
                   f"extents and piece lengths are plausible in {survey.likely_units[0]}")
    elif survey.scale is not None and not survey.scale.plausible and survey.likely_units:
        out.append(f"units = {_toml(survey.likely_units[0])}   # read in {survey.units}: "
                   f"{survey.scale.reason}")
    elif survey.units:
        out.append(f"# units = {_toml(survey.units)}   # from {'$INSUNITS' if survey.units_source == 'header' else 'the config'}; "
                   "set it only to override the header")
    else:
        out.append('# units = "mm"   # the drawing is unitless: give its units')
    attribute = survey.suggested_tag_attribute()
    if attribute is not None:
        out.append(f"tag_attribute = {_toml(attribute)}   # no block carries {survey.tag_attribute}; "
                   f"{survey.tag_like_attributes[attribute]} blocks have a {attribute} that reads as a tag")
    elif survey.tagged_inserts == 0 and survey.tag_texts:
        out.append(f"tags_from_text = true   # no block carries a {survey.tag_attribute} attribute; "
                   f"{len(survey.tag_texts)} texts read as tags")
        sym = survey.symbol_layers()
        if sym:
            out.append(f"tag_symbol_layers = [{', '.join(_toml(n) for n in sym)}]   "
                       "# circles/points with a tag-like text near them")
    out += ["", "[drawing.route_layers]", "# layer = [containment, IEC 60364-5-52 reference method]"]
    k = survey.metres_per_unit or 1.0
    unit = "m" if survey.metres_per_unit else "drawing units"
    for layer in sorted(survey.route_layers(), key=lambda x: x.name.lower()):
        length = f"{layer.line_length * k:.1f} {unit} of route"
        if layer.route_kind:
            out.append(f"# {_toml(layer.name)} is a route layer already ({', '.join(layer.route_kind)}); {length}")
            continue
        s = layer.suggestion
        assert s is not None
        out.append(f"{_toml(layer.name)} = [{_toml(s.containment)}, {_toml(s.method)}]   "
                   f"# the name says {s.word!r}; {length}")
    return "\n".join(out) + "\n"
