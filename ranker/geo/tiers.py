"""Which tier each corridor is in, for the map's colours and the GeoJSON ``tier``."""

from __future__ import annotations

import pandas as pd


def corridor_tiers(result) -> pd.Series | None:
    """Return the tier of each ranked corridor (1 = first), or None where the run has none.

    Tiers come from the ranking (``result.ranking["tier"]``) when the run
    groups corridors into tiers; the map then colours by tier, otherwise by
    rank.
    """
    ranking = result.ranking
    if "tier" not in ranking:
        return None
    return ranking["tier"]
