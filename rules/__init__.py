"""Rule packs shipped with bearing-audit (data files; see DEVELOPERS.md)."""
