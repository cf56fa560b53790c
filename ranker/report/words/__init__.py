"""Every sentence a person reads, written from the analyses' numbers and records.

The analyses (:mod:`ranker.stress`, :mod:`ranker.plan`, :mod:`ranker.score`)
return numbers and records; the modules here turn them into words for the
terminal, the workbook and the justification sheet. :mod:`.basic` holds the
pieces (names, ordinals, shares, lists, money, numbers); :mod:`.checks`,
:mod:`.tipping`, :mod:`.closeness`, :mod:`.futures` and :mod:`.plan` one
analysis each; :mod:`.stress` and :mod:`.inputs` the warning records (the
plan's in :mod:`.plan`). :mod:`ranker.report.narrative` is the door the
outputs use.
"""

from .basic import Namer, listing, ordinal, share_text, weight_text

__all__ = ["Namer", "listing", "ordinal", "share_text", "weight_text"]
