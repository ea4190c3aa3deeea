"""No silent coercion at the model edge: a count, a switch or a ratio is given as itself."""

from __future__ import annotations

import pytest
from pydantic import ValidationError

from reviewer.testing import make_build

PACK = {"chemistry": "li-ion", "cells_series": 7}


@pytest.mark.parametrize(
    "data",
    [
        {"battery": {**PACK, "cells_series": "7"}},  # a string is not a count
        {"battery": {**PACK, "cells_series": 7.0}},  # nor a float
        {"battery": {**PACK, "cells_series": True}},  # nor a boolean (read as a 1-cell pack)
        {"battery": {**PACK, "bms": "yes"}},
        {"battery": {**PACK, "cells_parallel": "2"}},
        {"motors": [{"type": "brushed", "cooling": {"fan": "off"}}]},
        {"motors": [{"type": "brushed", "cooling": {"inlet_blocked": 1}}]},
        {"usage": {"rolling_resistance": "0.01"}},
        {"drivetrain": {"ratio": "4"}},
        {"drivetrain": {"ratio": True}},
        {
            "wires": [
                {
                    "name": "w",
                    "circuit": "battery",
                    "gauge": "12 AWG",
                    "length": "1 m",
                    "bundled_with": "2",
                }
            ]
        },
    ],
)
def test_values_of_the_wrong_type_are_refused(data) -> None:
    with pytest.raises(ValidationError):
        make_build(data)


def test_a_whole_number_is_still_a_number_where_a_ratio_is_asked() -> None:
    assert make_build({"drivetrain": {"ratio": 4}}).drivetrain.ratio == 4.0
    assert make_build({"battery": {**PACK, "bms": {"fitted": True}}}).battery.bms.fitted is True
