"""The demo job's invented scenario: a ceramics workshop with three boards, its people, instruments and
observations.

Everything here is made up (site, people, client, serial numbers, readings, the maker's let-through
figures and the library curve); it matches no real site, person or product. The readings are chosen
so that most circuits pass and a few fail one test each, with one primary cause an electrician would
recognise: Zs too high for the device, an RCD too slow or not tripping on its button, low insulation,
reversed polarity, a ring with a break, a continuity reading that does not agree with the cable.
"""

from __future__ import annotations

DEMO_PIN = "2468"
DEMO_CURVE_NAME = "Workshop incomer 100 A moulded-case breaker (demo points, invented)"
DEMO_CURVE_POINTS = [[130, 3000], [200, 400], [300, 90], [450, 30], [600, 0.04], [2000, 0.02]]

PEOPLE = (("Rosa Quennell", "qualified"), ("Tomasz Brill", "apprentice"), ("Ines Okafor", "supervisor"))

JOB = {
    "client_ref": "TY-2026-118",
    "client_name": "Wexcombe Clay Cooperative",
    "client_address": "c/o 14 Saddler Lane, Wexcombe",
    "site_address": "Unit 7, Tannery Yard, Harlow Mill Road, Wexcombe",
    "description": "Periodic verification: ceramics workshop, kiln room and detached glaze store",
    "purpose": "periodic",
    "date": "2026-11-24",
    "next_inspection": "2031-11-24",
    "limitations": (
        "Kiln 1 was firing (about 900 °C): its internal wiring and element connections were not "
        "inspected. The ceiling void above the office was not accessible; cables there were seen only "
        "where they enter the board."
    ),
    "system": "TN-C-S",
    "u0": "230 V",
    "cmin": "0.95",
    "ze": "0.28 Ω",
    "pfc": "1.9 kA",
}

INSTRUMENTS = (
    {"name": "Multifunction installation tester", "serial": "MFT-20931", "calibration_date": "2026-03-14"},
    {"name": "Insulation resistance tester", "serial": "IR-4471", "calibration_date": "2026-06-02"},
    {"name": "Clamp meter", "serial": "CM-118", "calibration_date": "2026-01-20"},
)

# (severity, location, finding, circuits concerned as (board, circuit number))
OBSERVATIONS = (
    ("serious", "Meter cupboard",
     "No main protective bonding to the incoming water pipe: the bonding clamp is missing and the "
     "conductor hangs loose.", ()),
    ("attention", "Kiln room, east wall",
     "Kiln 2 cannot be isolated at the kiln: the isolator's label is missing and its handle is broken.",
     (("DB-2", "2"),)),
    ("attention", "Workshop, bench 3",
     "Socket-outlet faceplate cracked; the circuit's insulation reads low and the polarity of the office "
     "lighting is reversed at the switch.", (("DB-1", "5"), ("DB-1", "4"))),
    ("note", "Glaze store",
     "The board has no schedule of circuits on its door; one was written during this visit.", ()),
)

_T_E_25 = {"line_csa": "2.5", "cpc_csa": "1.5", "cpc_arrangement": "in-cable"}
_T_E_15 = {"line_csa": "1.5", "cpc_csa": "1.0", "cpc_arrangement": "in-cable"}
_MCB_25 = {"breaking_capacity": "6 kA", "let_through_i2t": "30000", "let_through_at": "6 kA"}
_MCB_15 = {"breaking_capacity": "6 kA", "let_through_i2t": "12000", "let_through_at": "6 kA"}
_RCD_30_A = {"rcd_idn": "30 mA", "rcd_type": "general", "rcd_waveform": "A", "rcd_additional": "yes"}
_RCD_30_AC = {"rcd_idn": "30 mA", "rcd_type": "general", "rcd_waveform": "AC", "rcd_additional": "yes"}
_NO_RCD = {"rcd_idn": "", "rcd_waveform": "", "rcd_additional": "", "rcd_type": ""}
_INSULATION_OK = {"insulation_test_voltage": "500 V", "insulation_line_line": ">999",
                  "insulation_line_earth": ">999"}
_RCD_TESTS_OK = {"rcd_time_1x": "23 ms", "rcd_time_5x": "12 ms", "rcd_test_button": "yes"}

# (designation, location, supplied from, board fields, circuits); each circuit is
# (number, description, fields as typed). Fields not given are copied from the previous circuit
# (except the circuit's own: its points, length, ring and every reading).
BOARDS: list[tuple[str, str, str, dict[str, str], list[tuple[str, str, dict[str, str]]]]] = [
    (
        "DB-1",
        "Workshop entrance, north wall",
        "Origin (meter cupboard)",
        {"origin": "yes", "ze": "0.28 Ω", "pfc": "1.9 kA", "main_device": "switch-disconnector",
         "main_rating": "100 A", "earthing_csa": "16 mm²", "bonding_csa": "10 mm²"},
        [
            ("1", "Workshop sockets (ring)", {
                "role": "final", "device_kind": "rcbo", "device_curve": "B", "device_rating": "32",
                **_MCB_25, **_RCD_30_A, "line_material": "copper", "line_insulation": "thermoplastic-70",
                "cpc_material": "copper", **_T_E_25, "wiring_type": "flat twin and earth",
                "reference_method": "C", "points_served": "10", "length_m": "76 m", "ring": "yes",
                "ring_r1": "0.56", "ring_rn": "0.57", "ring_r2": "0.93", **_INSULATION_OK,
                "polarity": "yes", "zs": "0.66", "zsc": "0.55", "test_temp_c": "18 °C", **_RCD_TESTS_OK}),
            ("2", "Office sockets (radial)", {
                "device_rating": "20", "points_served": "6", "length_m": "21 m", "r1r2": "0.41",
                **_INSULATION_OK, "polarity": "yes", "zs": "710 mΩ", "zsc": "0.62", "test_temp_c": "18 °C",
                "rcd_time_1x": "340 ms", "rcd_time_5x": "31 ms", "rcd_test_button": "yes"}),
            ("3", "Workshop lighting", {
                "device_kind": "mcb", "device_rating": "6", **_MCB_15, **_NO_RCD, **_T_E_15,
                "points_served": "12", "length_m": "28 m", "r1r2": "0.85", "ze": "0.28 Ω",
                "insulation_test_voltage": "500 V", "insulation_line_line": "260",
                "insulation_line_earth": ">999",
                "polarity": "yes", "test_temp_c": "18 °C"}),
            ("4", "Office lighting", {
                "points_served": "6", "length_m": "15 m", "r2": "0.28", **_INSULATION_OK, "polarity": "no",
                "zs": "0.74", "test_temp_c": "18 °C"}),
            ("5", "Wheel benches", {
                "device_kind": "rcbo", "device_curve": "C", "device_rating": "16", **_MCB_25, **_RCD_30_A,
                **_T_E_25, "points_served": "4", "length_m": "17 m", "r1r2": "0.33",
                "insulation_test_voltage": "500 V", "insulation_line_line": "85",
                "insulation_line_earth": "0.62",
                "polarity": "yes", "zs": "0.62", "zsc": "0.48", "test_temp_c": "18 °C", **_RCD_TESTS_OK}),
            ("6", "Pug mill motor", {
                "device_kind": "mcb", "device_curve": "D", "device_rating": "16", **_NO_RCD,
                "wiring_type": "armoured (SWA)", "reference_method": "E", "points_served": "1",
                "length_m": "33 m", "r1r2": "0.65", **_INSULATION_OK, "polarity": "yes", "zs": "0.93",
                "zsc": "0.71", "test_temp_c": "18 °C"}),
            ("7", "Extract fan", {
                "device_curve": "C", "device_rating": "10", **_MCB_15, **_T_E_15,
                "wiring_type": "flat twin and earth", "reference_method": "C", "points_served": "1",
                "length_m": "19 m", "r1r2": "0.57", **_INSULATION_OK, "polarity": "yes", "zs": "0.86",
                "zsc": "0.72", "test_temp_c": "18 °C"}),
            ("8", "Water heater", {
                "device_curve": "B", "device_rating": "16", **_MCB_25, **_T_E_25, "points_served": "1",
                "length_m": "12 m", "r1r2": "0.71", **_INSULATION_OK, "polarity": "yes", "zs": "0.99",
                "zsc": "0.52", "test_temp_c": "18 °C"}),
            ("9", "Glaze spray booth", {
                "device_curve": "C", "device_rating": "32", "line_csa": "6", "cpc_csa": "2.5",
                "let_through_i2t": "60000", "points_served": "2", "length_m": "44 m", "r1r2": "0.46",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.91", "zsc": "0.49", "test_temp_c": "18 °C"}),
            ("10", "Sub-main to kiln room board DB-2", {
                "role": "distribution", "device_kind": "curve", "device_curve": "", "device_rating": "100",
                "breaking_capacity": "25 kA", "let_through_i2t": "", "let_through_at": "",
                "line_csa": "25", "line_insulation": "thermosetting-90", "cpc_csa": "16",
                "cpc_arrangement": "armour", "cpc_material": "steel", "wiring_type": "armoured (SWA)",
                "reference_method": "D1", "points_served": "1", "length_m": "18 m", "r1r2": "0.04",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.31", "zsc": "0.27", "test_temp_c": "12 °C"}),
            ("11", "Feed to glaze store board DB-3", {
                "device_kind": "mcb", "device_curve": "C", "device_rating": "40",
                "breaking_capacity": "10 kA",
                "rcd_idn": "100 mA", "rcd_type": "s", "rcd_waveform": "A", "rcd_additional": "no",
                "line_csa": "10", "line_insulation": "thermoplastic-70", "cpc_csa": "10",
                "cpc_material": "copper", "cpc_arrangement": "separate", "cpc_insulation": "pvc",
                "cpc_bunched": "no", "cpc_protected": "yes", "wiring_type": "singles in conduit",
                "reference_method": "B1", "points_served": "1", "length_m": "30 m", "r1r2": "0.11",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.39", "zsc": "0.33", "test_temp_c": "12 °C",
                "rcd_time_1x": "210 ms", "rcd_time_5x": "78 ms", "rcd_test_button": "yes"}),
            ("12", "Spare way, kept for a second kiln controller", {
                "role": "final", "device_curve": "B", "device_rating": "16", **_MCB_25, **_NO_RCD, **_T_E_25,
                "cpc_arrangement": "in-cable", "cpc_insulation": "", "cpc_bunched": "", "cpc_protected": "",
                "wiring_type": "", "reference_method": ""}),
            ("13", "Classroom sockets (ring)", {
                "device_kind": "rcbo", "device_curve": "B", "device_rating": "32", **_RCD_30_A,
                "wiring_type": "flat twin and earth", "reference_method": "C", "points_served": "8",
                "length_m": "65 m", "ring": "yes", "ring_r1": "0.48", "ring_rn": "0.79", "ring_r2": "0.81",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.65", "zsc": "0.52",
                "test_temp_c": "18 °C", **_RCD_TESTS_OK}),
        ],
    ),
    (
        "DB-2",
        "Kiln room, east wall",
        "DB-1 way 10",
        {"ze": "0.31 Ω", "pfc": "0.85 kA", "main_device": "switch-disconnector", "main_rating": "100 A"},
        [
            ("1", "Kiln 1", {
                "role": "final", "device_kind": "fuse-gg", "device_curve": "", "device_rating": "32",
                "library_device_id": "", "breaking_capacity": "80 kA", "line_csa": "6",
                "line_material": "copper", "line_insulation": "thermosetting-90", "cpc_csa": "2.5",
                "cpc_material": "copper", "cpc_arrangement": "in-cable", "wiring_type": "armoured (SWA)",
                "reference_method": "C", "points_served": "1", "length_m": "14 m", "r1r2": "0.15",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.46", "zsc": "0.38", "test_temp_c": "31 °C"}),
            ("2", "Kiln 2", {
                "points_served": "1", "length_m": "80 m", "r1r2": "0.93", **_INSULATION_OK, "polarity": "yes",
                "zs": "1.21", "zsc": "0.88", "test_temp_c": "31 °C"}),
            ("3", "Kiln room sockets", {
                "device_kind": "rcbo", "device_curve": "B", "device_rating": "20",
                "breaking_capacity": "6 kA",
                "let_through_i2t": "30000", "let_through_at": "6 kA", **_RCD_30_A, **_T_E_25,
                "line_insulation": "thermoplastic-70", "wiring_type": "singles in conduit",
                "reference_method": "B1", "points_served": "4", "length_m": "16 m", "r1r2": "0.32",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.64", "zsc": "0.52", "test_temp_c": "24 °C",
                **_RCD_TESTS_OK}),
            ("4", "Kiln controller", {
                "device_kind": "mcb", "device_rating": "10", "let_through_i2t": "12000", **_NO_RCD,
                "line_csa": "1.5", "cpc_csa": "1.5", "points_served": "1", "length_m": "9 m", "r1r2": "0.22",
                **_INSULATION_OK, "polarity": "yes", "zs": "0.54", "zsc": "0.47", "test_temp_c": "24 °C"}),
            ("5", "Dryer cabinet", {
                "device_kind": "rcbo", "device_rating": "16", "let_through_i2t": "30000",
                "rcd_idn": "30 mA", "rcd_type": "general", "rcd_waveform": "F", "rcd_additional": "yes",
                **_T_E_25, "points_served": "1", "length_m": "11 m", "r1r2": "0.22", **_INSULATION_OK,
                "polarity": "yes", "zs": "0.55", "zsc": "0.45", "test_temp_c": "24 °C",
                "rcd_time_1x": "29 ms", "rcd_time_5x": "14 ms", "rcd_test_button": "no"}),
            ("6", "Kiln room lighting", {
                "device_kind": "mcb", "device_rating": "6", "let_through_i2t": "12000", **_NO_RCD, **_T_E_15,
                "wiring_type": "singles in conduit", "points_served": "4", "length_m": "13 m",
                "r1r2": "0.40", **_INSULATION_OK, "polarity": "no", "zs": "0.72", "zsc": "0.58",
                "test_temp_c": "24 °C"}),
            ("7", "Inspection lamp transformer (SELV 12 V)", {
                "selv": "yes", "points_served": "1", "length_m": "6 m", "r1r2": "0.19",
                "insulation_test_voltage": "250 V", "insulation_line_line": "120",
                "insulation_line_earth": "95",
                "polarity": "yes", "zs": "0.51", "zsc": "0.44", "test_temp_c": "24 °C"}),
        ],
    ),
    (
        "DB-3",
        "Glaze store, inside the door",
        "DB-1 way 11",
        {"system": "TT", "ze": "48 Ω", "ra": "46 Ω", "pfc": "0.6 kA", "main_device": "RCD",
         "main_rating": "40 A"},
        [
            ("1", "Glaze store sockets", {
                "role": "final", "device_kind": "rcbo", "device_curve": "B", "device_rating": "16",
                **_MCB_25, **_RCD_30_A, "line_material": "copper", "line_insulation": "thermoplastic-70",
                "cpc_material": "copper", **_T_E_25, "wiring_type": "flat twin and earth",
                "reference_method": "C", "points_served": "3", "length_m": "9 m", "r1r2": "0.19",
                **_INSULATION_OK, "polarity": "yes", "zs": "49.2", "zsc": "0.64", "test_temp_c": "9 °C",
                **_RCD_TESTS_OK}),
            ("2", "Glaze store lighting", {
                "device_rating": "6", **_MCB_15, **_RCD_30_AC, **_T_E_15, "points_served": "3",
                "length_m": "8 m", "r1r2": "0.24", **_INSULATION_OK, "polarity": "yes", "zs": "49.6",
                "zsc": "0.93", "test_temp_c": "9 °C", "rcd_time_1x": "26 ms", "rcd_time_5x": "13 ms",
                "rcd_test_button": "no"}),
            ("3", "Panel heater", {
                "device_rating": "10", **_MCB_25, **_RCD_30_A, **_T_E_25, "points_served": "1",
                "length_m": "7 m", "r1r2": "0.14", **_INSULATION_OK, "polarity": "yes", "zs": "49.9",
                "zsc": "0.71", "test_temp_c": "9 °C", "rcd_time_1x": "35 ms", "rcd_time_5x": "52 ms",
                "rcd_test_button": "yes"}),
            ("4", "Outside light by the door", {
                "device_rating": "6", **_MCB_15, **_RCD_30_AC, **_T_E_15, "wiring_type": "armoured (SWA)",
                "reference_method": "D1", "points_served": "1", "length_m": "10 m", "r1r2": "0.31",
                "insulation_test_voltage": "500 V", "insulation_line_line": "140",
                "insulation_line_earth": "0.31", "polarity": "yes", "zs": "50.3", "zsc": "1.02",
                "test_temp_c": "9 °C", **_RCD_TESTS_OK}),
        ],
    ),
]
