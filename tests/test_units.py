"""Unit parsing and conversion to SI (fitkin.units)."""
import math

import numpy as np
import pytest

from fitkin import units
from fitkin.errors import InputError, UnitError

# Conversion factors, each with its source:
# NIST SP 811 (2008), Appendix B.8/B.9:
#   1 P = 1e-1 Pa s; 1 cP = 1e-3 Pa s; (µP = 1e-6 P = 1e-7 Pa s, SI prefix)
#   1 Btu_IT ft/(h ft² °F) = 1.730 735 W/(m K)
#   1 Btu_IT = 1055.055 852 62 J
#   1 bar = 1e5 Pa; 1 torr = 101325/760 Pa; 1 atm = 101325 Pa
#   T/K = t/°C + 273.15;  T/K = (t/°F + 459.67)/1.8; a 1 °F interval is 5/9 K
# SI Brochure (9th ed., 2019): Pa = kg m⁻¹ s⁻², W = kg m² s⁻³, prefixes µ = 1e-6, m = 1e-3.
VISCOSITY_SPELLINGS = [
    ("Pa·s", 1.0),                # SI
    ("Pa s", 1.0),
    ("Pa*s", 1.0),
    ("mPa*s", 1e-3),              # SI prefix
    ("mPa s", 1e-3),
    ("µPa·s", 1e-6),              # U+00B5 MICRO SIGN
    ("\u03bcPa·s", 1e-6),         # U+03BC GREEK SMALL LETTER MU
    ("uPa s", 1e-6),
    ("µPa s", 1e-6),
    ("cP", 1e-3),                 # NIST SP 811 B.8
    ("P", 0.1),                   # NIST SP 811 B.8
    ("µP", 1e-7),                 # NIST SP 811 B.8 with the SI prefix
    ("kg/(m s)", 1.0),            # SI Brochure: Pa s = kg m⁻¹ s⁻¹
    ("kg m⁻¹ s⁻¹", 1.0),
    ("mPas", 1e-3),               # lab shorthand (common practice), read as mPa s
]
CONDUCTIVITY_SPELLINGS = [
    ("W/(m K)", 1.0),
    ("W/(m*K)", 1.0),
    ("W/(m·K)", 1.0),
    ("mW/(m·K)", 1e-3),
    ("mW/(m K)", 1e-3),
    ("W m^-1 K^-1", 1.0),
    ("W m⁻¹ K⁻¹", 1.0),           # unicode superscripts
    ("W m-1 K-1", 1.0),           # bare exponents, common in papers
    ("W/mK", 1.0),                # lab shorthand (common practice), not W per millikelvin
    ("Btu/(h ft °F)", 1.730735),  # NIST SP 811 B.9, International Table Btu
    ("Btu/(h*ft*degF)", 1.730735),
]


@pytest.mark.parametrize("text, factor", VISCOSITY_SPELLINGS)
def test_viscosity_spellings_convert_to_pascal_seconds(text, factor):
    unit = units.parse_unit(text)
    assert units.to_si([2.0], unit, "Pa s")[0] == pytest.approx(2.0 * factor, rel=1e-12)


@pytest.mark.parametrize("text, factor", CONDUCTIVITY_SPELLINGS)
def test_conductivity_spellings_convert_to_watt_per_metre_kelvin(text, factor):
    unit = units.parse_unit(text)
    # 1.730735 is given to 7 digits in NIST SP 811
    assert units.to_si([1.0], unit, "W/(m K)")[0] == pytest.approx(factor, rel=5e-7)


def test_btu_is_the_international_table_btu():
    # Source: NIST SP 811 (2008), B.8: 1 Btu_IT = 1055.05585262 J (not the ISO/EC 1055.056 J)
    assert units.to_si([1.0], units.parse_unit("Btu"), "J")[0] == pytest.approx(1055.05585262, rel=1e-11)


@pytest.mark.parametrize("text", ["K", "kelvin"])
def test_kelvin_is_unchanged(text):
    assert units.to_si([300.0], units.parse_unit(text), "K")[0] == 300.0


@pytest.mark.parametrize("text", ["°C", "degC", "deg C", "℃"])
def test_celsius_temperatures_get_their_offset(text):
    # Source: NIST SP 811 (2008) 4.2.1.1: T/K = t/°C + 273.15
    unit = units.parse_unit(text)
    got = units.to_si([26.85, -273.0, 0.0], unit, "K")
    np.testing.assert_allclose(got, [300.0, 0.15, 273.15], rtol=0, atol=1e-9)


@pytest.mark.parametrize("text", ["°F", "degF"])
def test_fahrenheit_temperatures_get_their_offset(text):
    # Source: NIST SP 811 (2008) B.9: T/K = (t/°F + 459.67)/1.8
    got = units.to_si([80.33, 32.0], units.parse_unit(text), "K")
    np.testing.assert_allclose(got, [(80.33 + 459.67) / 1.8, 273.15], rtol=0, atol=1e-9)


def test_uncertainties_in_celsius_and_fahrenheit_are_differences():
    # Source: NIST SP 811 (2008) 4.2.1.1 and B.9: an interval of 1 °C is 1 K, of 1 °F is 5/9 K
    assert units.to_si([0.5], units.parse_unit("°C"), "K", difference=True)[0] == pytest.approx(0.5)
    assert units.to_si([0.9], units.parse_unit("°F"), "K", difference=True)[0] == pytest.approx(0.5)
    assert units.to_si([0.5], units.parse_unit("K"), "K", difference=True)[0] == 0.5


def test_offset_and_relative_units_are_recognised():
    assert units.is_offset_unit(units.parse_unit("°C"))
    assert not units.is_offset_unit(units.parse_unit("K"))
    assert units.is_relative_unit(units.parse_unit("%"))
    assert not units.is_relative_unit(units.parse_unit("uPa s"))


def test_same_unit_compares_scales():
    assert units.same_unit(units.parse_unit("µPa·s"), units.parse_unit("uPa s"))
    assert units.same_unit(units.parse_unit("cP"), units.parse_unit("mPa s"))
    assert not units.same_unit(units.parse_unit("cP"), units.parse_unit("µPa s"))
    assert not units.same_unit(units.parse_unit("°C"), units.parse_unit("K"))


def test_wrong_dimension_raises_unit_error_with_location():
    with pytest.raises(UnitError) as info:
        units.to_si([1.0], units.parse_unit("mPa"), "Pa s", file="f.csv", column="eta [mPa]")
    assert "f.csv" in str(info.value) and "eta [mPa]" in str(info.value)
    assert "Pa s" in info.value.message


@pytest.mark.parametrize("text", ["blorp", "m/(s", "", "   "])
def test_unparseable_unit_raises_unit_error(text):
    with pytest.raises(UnitError) as info:
        units.parse_unit(text, file="f.csv", column="x", row=1)
    assert isinstance(info.value, InputError)
    assert info.value.file == "f.csv" and info.value.column == "x" and info.value.row == 1
    assert info.value.hint


@pytest.mark.parametrize("text, si_unit, expected", [
    ("1.5 bar", "Pa", 1.5e5),                     # NIST SP 811 B.8: 1 bar = 1e5 Pa
    ("760 Torr", "Pa", 101325.0),                 # NIST SP 811 B.8: 1 torr = 101325/760 Pa
    ("1 atm", "Pa", 101325.0),                    # NIST SP 811 B.8
    ("39.948 g/mol", "kg/mol", 0.039948),         # SI prefix g = 1e-3 kg
    ("25 °C", "K", 298.15),                       # NIST SP 811 4.2.1.1
    ("  2e-3 kg/mol ", "kg/mol", 2e-3),
    ("−40 °F", "K", 233.15),                      # U+2212 minus; −40 °F = −40 °C
])
def test_parse_quantity_to_si(text, si_unit, expected):
    assert units.parse_quantity(text, si_unit) == pytest.approx(expected, rel=1e-12)


def test_parse_quantity_uses_default_unit_only_for_bare_numbers():
    assert units.parse_quantity("39.948", "kg/mol", default_unit="g/mol") == pytest.approx(0.039948)
    assert units.parse_quantity("0.04 kg/mol", "kg/mol", default_unit="g/mol") == pytest.approx(0.04)


@pytest.mark.parametrize("text, fragment", [
    ("39.948", "has no unit"),
    ("1.5 m", "convertible to Pa"),
    ("bar", "expected a number"),
    ("1.5 flurbs", "cannot read the unit"),
    ("1,5 bar", "decimal comma"),
])
def test_parse_quantity_errors_name_the_option(text, fragment):
    with pytest.raises(UnitError) as info:
        units.parse_quantity(text, "Pa", name="--pressure")
    assert "--pressure" in str(info.value) and fragment in str(info.value)


def test_normalize_rewrites_lab_spellings():
    assert units.normalize_unit_text("Btu/(h ft °F)") == "Btu_it/(h*ft*degF)"
    assert units.normalize_unit_text("W m⁻¹ K⁻¹") == "W*m^-1*K^-1"
    assert units.normalize_unit_text("µPa·s") == "uPa*s"


def test_single_registry_is_shared():
    # every unit made by parse_unit belongs to fitkin.units.ureg, so they combine
    product = units.parse_unit("Pa") * units.parse_unit("s")
    assert units.same_unit(product, units.ureg.parse_units("Pa*s"))
    assert math.isclose(units.ureg.Quantity(1, "cP").to("Pa*s").magnitude, 1e-3)


@pytest.mark.parametrize("text", ["°K", "deg K", "degK", "\u212a"])
def test_obsolete_degree_kelvin_and_kelvin_sign_are_the_kelvin(text):
    # the degree-kelvin was renamed kelvin in 1967 (13th CGPM; SI Brochure, 9th ed., 2019)
    assert units.same_unit(units.parse_unit(text), units.ureg.kelvin)


@pytest.mark.parametrize("text", ["Celsius", "degrees Celsius", "deg. C", "° C"])
def test_celsius_spelled_out(text):
    assert units.to_si([0.0], units.parse_unit(text), "K")[0] == pytest.approx(273.15)


@pytest.mark.parametrize("text", ["°", "deg", "deg*K*m"])
def test_a_lone_degree_sign_is_not_read_as_an_angle(text):
    # pint's 'deg' is the plane angle π/180; 'deg K' must not become 0.01745 K
    with pytest.raises(UnitError) as info:
        units.parse_unit(text)
    assert "degree sign" in info.value.message


# --- offset conversions keep the precision the lab wrote ---------------------------------------
def test_celsius_conversion_is_exact_to_the_digits_written():
    # 273.15 K is the defined offset of the Celsius scale (SI Brochure, 9th ed., 2.3.1)
    c = units.parse_unit("°C")
    converted = units.to_si([-243.15, 26.85, 20.123, -273.0, 1000.5], c, "K")
    assert list(converted) == [30.0, 300.0, 293.273, 0.15, 1273.65]       # exact, not 29.99999999999997
    assert -243.15 + 273.15 != 30.0                                          # the plain float sum is not
    assert float(units.to_si(-243.15, c, "K")) == 30.0
    assert units.parse_quantity("-243.15 °C", "K", name="T") == 30.0
    assert np.isnan(units.to_si([np.nan, 26.85], c, "K")[0])


def test_fahrenheit_conversion_round_trips_to_the_digits_written():
    # T/K = (t/°F + 459.67) × 5/9 (NIST SP 811 (2008), B.8)
    f = units.parse_unit("°F")
    written = np.array([80.3, -405.67, 32.0, 212.0, 98.65])
    kelvin = units.to_si(written, f, "K")
    assert list(kelvin[1:4]) == [30.0, 273.15, 373.15]
    np.testing.assert_allclose(kelvin, (written + 459.67) * 5 / 9, rtol=0, atol=5e-6)
    back = kelvin * 9 / 5 - 459.67
    assert list(np.round(back, 2)) == list(written)


def test_celsius_table_round_trips_through_a_saved_fit(tmp_path):
    # invented viscosities of a noble-gas-like size; the point is the saved temperatures
    import json
    from fitkin.cli import main
    path = tmp_path / "c.csv"
    path.write_text("T [°C],viscosity [uPa s]\n-243.15,5.0\n-193.15,8.0\n-123.15,12.3\n26.85,22.7\n",
                    encoding="utf-8")
    code = main(["fit", str(path), "--formula", "Ar", "--potential", "hs", "--order", "1", "--no-report",
                 "--out", str(tmp_path / "fit")])
    assert code == 0
    record = json.loads((tmp_path / "fit" / "parameters.json").read_text(encoding="utf-8"))
    assert record["data"]["temperature_range_K"] == [30.0, 300.0]
    assert sorted(r["T_K"] for r in record["residuals"]) == [30.0, 80.0, 150.0, 300.0]
