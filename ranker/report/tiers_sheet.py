"""The results workbook's ``Tiers`` sheet: the pairwise winning shares behind the tiers."""

from __future__ import annotations

import pandas as pd
from openpyxl.utils import get_column_letter

from .narrative import pairwise_note, tier_rule
from .summary import has_samples
from .workbook import NOTE_FONT, colour_scale, put


def tiers_sheet(writer, result) -> None:
    """Tier per corridor and the matrix of pairwise winning shares (colour scale)."""
    rob = result.robustness
    if rob is None:
        return
    ws = writer.sheet("Tiers", "Which parts of the order do the samples settle?")
    put(ws, 3, 1, tier_rule(result)).font = NOTE_FONT
    if not has_samples(rob) or rob.pairwise_wins is None:
        return
    put(ws, 4, 1, pairwise_note(result)).font = NOTE_FONT
    ids = list(rob.pairwise_ids)
    frame = pd.DataFrame(rob.pairwise_wins, index=pd.Index(ids, name="corridor_id"), columns=ids)
    frame.insert(0, "tier", result.ranking["tier"].reindex(ids).to_numpy())
    top, left, bottom, right = writer.table(
        ws,
        frame,
        top=6,
        index_label="corridor_id",
        name="pairwise_wins",
        formats={c: "0%" for c in ids},
    )
    colour_scale(ws, f"{get_column_letter(left + 2)}{top + 1}:{get_column_letter(right)}{bottom}")
