"""Errors carry their data (issue 11, item 3; STYLE.md "Exceptions carry data").

Each error raised on bad input names the file, row, column, value, entity or
circuit as fields, with what to do and an IssueCode; the message is the one
line contract.md asks for ("file, row/entity, what to do"), composed from
those fields.  The places are checked against the files the tests write
(the row a blank cell is on, counted in the file), and the round trip
through the standard library's ``pickle`` (batch mode sends results between
worker processes) keeps message and fields.
"""

from __future__ import annotations

import pickle

import pytest
from cablewright.core import errors
from cablewright.core.errors import (
    CableRouteError,
    CircuitInputError,
    ConfigError,
    DrawingReadError,
    IssueCode,
    OutOfRangeError,
    ScheduleError,
    UnknownKeyError,
)
from cablewright.extract.dxf_reader import read_dxf
from cablewright.extract.schedule import read_schedule
from cablewright.sizing.chain import SupplyCycleError, chain_drops
from cablewright.sizing.config import SizingConfig
from cablewright.sizing.correction_tables import ambient_air_factor
from cablewright.sizing.fields import spec_from_fields

from cablewright.exits import EXIT_INPUT, exit_code_for

ERROR_CLASSES = [getattr(errors, name) for name in errors.__all__
                 if isinstance(getattr(errors, name), type)
                 and issubclass(getattr(errors, name), CableRouteError)]


def test_a_blank_circuit_cell_names_the_file_row_and_column(tmp_path):
    path = tmp_path / "loads.csv"
    # line 1 the header, line 2 a circuit, line 3 the blank circuit cell
    path.write_text("circuit,from,to,load\nP-1,MCC,M1,5 kW\n,MCC,M2,5 kW\n", encoding="utf-8")
    with pytest.raises(ScheduleError) as info:
        read_schedule(path)
    exc = info.value
    assert (exc.file, exc.row, exc.column) == (str(path), 3, "circuit")
    assert exc.fix == "give every row a circuit id" and exc.code is IssueCode.SCHEDULE_UNUSABLE
    assert str(exc) == f"{path} row 3: {exc.problem}; {exc.fix}"


def test_a_line_break_in_a_cell_carries_its_value(tmp_path):
    path = tmp_path / "loads.csv"
    path.write_text('circuit,from,to,load\nP-1,"MCC\nA",M1,5 kW\n', encoding="utf-8")
    with pytest.raises(ScheduleError) as info:
        read_schedule(path)
    assert (info.value.row, info.value.column, info.value.value) == (2, "from", "MCC\nA")


def test_a_missing_drawing_names_the_file_and_the_fix(tmp_path):
    missing = tmp_path / "nowhere.dxf"
    with pytest.raises(DrawingReadError) as info:
        read_dxf(missing)
    exc = info.value
    assert exc.file == str(missing) and exc.fix == "check the drawing path"
    assert exc.code is IssueCode.DRAWING_UNUSABLE and exit_code_for(exc) == EXIT_INPUT  # contract.md


def test_a_circuit_value_out_of_range_names_circuit_column_and_value():
    with pytest.raises(CircuitInputError) as info:
        spec_from_fields("P-7", {"load": "5 kW", "power_factor": "1.2"}, SizingConfig())
    exc = info.value
    assert (exc.circuit_id, exc.column, exc.value) == ("P-7", "power_factor", 1.2)
    assert str(exc) == "circuit P-7: power factor 1.2 is outside (0, 1]"


def test_an_unknown_choice_lists_what_is_known():
    with pytest.raises(UnknownKeyError) as info:
        spec_from_fields("P-7", {"load": "5 kW", "conductor": "gold"}, SizingConfig())
    exc = info.value
    assert exc.value == "gold" and set(exc.known) == {"Cu", "Al"}
    assert exc.fix == "use one of Al, Cu"


def test_beyond_a_table_carries_value_limit_and_table():
    # IEC 60364-5-52:2009 Table B.52.14 ends at 80 °C for XLPE
    with pytest.raises(OutOfRangeError) as info:
        ambient_air_factor(85.0, "XLPE")
    exc = info.value
    assert (exc.value, exc.limit) == (85.0, 80)
    assert exc.source == "IEC 60364-5-52:2009 Table B.52.14"


def test_a_config_with_several_problems_keeps_one_line_each(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text("[sizing]\npower_factor = 3.0\nnot_a_key = 1\n", encoding="utf-8")
    from cablewright.config import load_settings

    with pytest.raises(ConfigError) as info:
        load_settings(path)
    exc = info.value
    assert len(exc.problems) >= 2 and str(exc).splitlines() == list(exc.problems)
    assert exc.file == str(path)


def test_every_error_class_has_a_code_of_its_own():
    codes = [cls.default_code for cls in ERROR_CLASSES]
    assert len(set(codes)) == len(codes)
    assert SupplyCycleError.default_code is IssueCode.SUPPLY_LOOP


@pytest.mark.parametrize("cls", ERROR_CLASSES, ids=lambda c: c.__name__)
def test_pickle_keeps_message_and_fields(cls):
    exc = cls(file="plant.dxf", row=4, column="load", value="5 kX", problem="the load does not parse",
              fix="write a number and a unit")
    back = pickle.loads(pickle.dumps(exc))
    assert type(back) is cls and str(back) == str(exc) == (
        "plant.dxf row 4: the load does not parse; write a number and a unit")
    assert vars(back) == vars(exc)


def test_a_supply_loop_survives_pickle_with_its_circuit_ids():
    drops = chain_drops({"P-10": 1.0, "P-11": 1.0}, {"P-10": "DB11", "P-11": "DB10"},
                        {"DB10": "P-10", "DB11": "P-11"})
    (loop,) = drops.loops
    back = pickle.loads(pickle.dumps(loop))
    assert set(back.circuit_ids) == {"P-10", "P-11"} and str(back) == str(loop)
    assert back.fix == "check the 'from' and 'to' tags of these circuits in the schedule"


def test_sizing_errors_carry_the_value_they_name():
    # IEC 60364-4-41:2005 Table 41.1 starts above U0 = 50 V a.c.; 40 V is below it
    from cablewright.sizing.disconnection import max_disconnection_time_s

    with pytest.raises(OutOfRangeError) as info:
        max_disconnection_time_s(40.0, 16.0, True)
    assert info.value.value == 40.0 and info.value.code is IssueCode.OUT_OF_RANGE
