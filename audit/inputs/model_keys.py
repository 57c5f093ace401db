"""The model file's vocabulary: the keys each of its mappings may hold, and the words of its choices.

The readers refuse any other key; ``schema.py`` publishes the same keys (a test holds the two together).
"""

from __future__ import annotations

TOP_KEYS = {"project", "materials", "layout", "members", "bearings", "loads"}


PROJECT_KEYS = {
    "title",
    "calc",
    "reviewer",
    "rule_pack",
    "combinations",
    "service",
    "tolerance",
    "date",
    "near_support_area",
    "near_support_kb",
    "uplift_note_below",
    "own_comment_from",
    "readings",
    "units",
}


# The older project keys for two readings, kept: each names a choice of the rule pack.
READING_KEYS = {"near_support_area": "near_support.area_limit", "near_support_kb": "near_support.kb_reading"}


MATERIAL_KEYS = {"family", "species", "grade", "fcp", "fc", "factors", "wet_factor", "source"}


MEMBER_KEYS = {
    "id",
    "material",
    "b",
    "d",
    "length",
    "orientation",
    "service",
    "KT",
    "support",
    "level",
    "label",
    "plies",
    "ply_thickness",
    "studs",
    "bears_on",
    "place",
    "note",
    "aliases",
    "separation",
}


BEARING_KEYS = {"id", "upper", "lower", "width", "aliases", "typical", "note", "calc_force", "hanger", "separation"}


SIDE_KEYS = {"member", "at", "length", "width", "angle", "notch"}
TOLERANCE_KEYS = {"relative", "absolute"}
WIND_KEYS = {"pressure", "suction"}  # W both ways, on a load or an area


LOAD_KEYS = {
    "id",
    "member",
    "type",
    "at",
    "from",
    "to",
    "length",
    "width",
    "specified",
    "factored",
    "duration",
    "label",
    "live",
    "note",
}


LIVE_KINDS = ("occupancy", "storage")  # storage: storage, equipment and service-room live load


ENGINEERED_FACTORS = ("KD", "KScp", "KB", "KZcp", "KT")


SUPPORTS = ("bearings", "continuous", "studs")


US_CUSTOMARY = ("nds",)  # standards whose memos show forces in kip unless the project says otherwise
