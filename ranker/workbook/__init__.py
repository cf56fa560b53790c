"""The workbook stage: the input contract, the blank template and the checked reader.

- :func:`write_template` writes the blank input workbook.
- :func:`check_file` checks the file itself (format, size, safety).
- :func:`read_workbook` returns :class:`Inputs`, or raises
  :class:`~ranker.errors.InputError` with every problem found.
- :data:`SHEETS`, :data:`FIELD_UNITS`, :data:`BUILTIN_CRITERIA` describe the contract.
"""

from ranker.workbook.read import LIMITS, Limits, check_file, read_workbook
from ranker.workbook.schema import (
    BUILTIN_CRITERIA,
    FIELD_UNITS,
    INSTRUCTIONS,
    SHEETS,
    TWINS,
    Field,
    SheetSchema,
    normalize_key,
    parse_weight_header,
    split_connects,
)
from ranker.workbook.tables import CriterionSpec, Inputs, WeightSet
from ranker.workbook.template import write_template

__all__ = [
    "BUILTIN_CRITERIA",
    "FIELD_UNITS",
    "INSTRUCTIONS",
    "LIMITS",
    "SHEETS",
    "TWINS",
    "CriterionSpec",
    "Field",
    "Inputs",
    "Limits",
    "SheetSchema",
    "WeightSet",
    "check_file",
    "normalize_key",
    "parse_weight_header",
    "read_workbook",
    "split_connects",
    "write_template",
]
