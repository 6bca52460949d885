"""Header cells: quantity names, units in headers, units=, uncertainties, sources, mixed tables."""
import numpy as np
import pytest

from fitkin.errors import InputError, InputProblems
from fitkin.io import lookup_kind, read_table
from fitkin.io.headers import column_letter, split_header


def write(tmp_path, name, text):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


@pytest.mark.parametrize("header, expected", [
    ("T [K]", ("T", "K")),
    ("Temperature (°C)", ("Temperature", "°C")),
    ("k (mW/(m·K))", ("k", "mW/(m·K)")),
    ("thermal conductivity [W/(m*K)]", ("thermal conductivity", "W/(m*K)")),
    ("viscosity", ("viscosity", None)),
    ("viscosity []", ("viscosity", "")),
    ("(K)", ("(K)", None)),
    ("T / K", ("T", "K")),                       # quantity calculus, ISO 80000-1
    ("η/(µPa s)", ("η", "µPa s")),
    ("k / (mW/(m K))", ("k", "mW/(m K)")),
    ("ratio a/b", ("ratio a/b", None)),          # not a known quantity before the '/'
])
def test_split_header(header, expected):
    assert split_header(header) == expected


@pytest.mark.parametrize("name, kind", [
    ("T", "temperature"), ("temperature", "temperature"), ("Temp", "temperature"),
    ("viscosity", "viscosity"), ("ETA", "viscosity"), ("η", "viscosity"), ("mu", "viscosity"),
    ("μ", "viscosity"), ("µ", "viscosity"), ("Dynamic  Viscosity", "viscosity"),
    ("thermal conductivity", "conductivity"), ("Thermal_Conductivity", "conductivity"),
    ("conductivity", "conductivity"), ("k", "conductivity"), ("Lambda", "conductivity"),
    ("λ", "conductivity"), ("p", "pressure"), ("Pressure", "pressure"),
])
def test_quantity_synonyms(name, kind):
    assert lookup_kind(name).name == kind


def test_unknown_name_is_none():
    assert lookup_kind("density") is None
    assert lookup_kind("viscosity k") is None  # name and symbol of different kinds


@pytest.mark.parametrize("name, kind", [
    ("Viscosity η", "viscosity"), ("Temperature T", "temperature"),
    ("thermal conductivity λ", "conductivity"), ("Pressure p", "pressure"),
])
def test_name_followed_by_its_symbol(name, kind):
    assert lookup_kind(name).name == kind


def test_quantity_calculus_headers(tmp_path):
    text = "T / °C,η/(µPa s),u(η) / %\n26.85,22.7,1\n"
    table = read_table(write(tmp_path, "qc.csv", text))
    s = table.get("viscosity")
    assert s.temperature[0] == pytest.approx(300.0) and s.value[0] == pytest.approx(22.7e-6)
    assert s.uncertainty[0] == pytest.approx(0.227e-6) and s.uncertainty_kind == "relative"


def test_column_letters():
    assert [column_letter(i) for i in (0, 1, 25, 26, 27, 701, 702)] == \
        ["A", "B", "Z", "AA", "AB", "ZZ", "AAA"]


# The header spellings of the brief; expected SI values computed by hand:
# µPa s = 1e-6 Pa s (SI prefix); cP = 1e-3 Pa s (NIST SP 811 (2008) B.8);
# mW/(m K) = 1e-3 W/(m K) (SI prefix); 1 Btu_IT/(h ft °F) = 1.730735 W/(m K) (NIST SP 811 B.9).
@pytest.mark.parametrize("header, cell, si", [
    ("viscosity [uPa s]", "22.7", 22.7e-6),
    ("Viscosity (µPa·s)", "22.7", 22.7e-6),
    ("eta [μPa·s]", "22.7", 22.7e-6),
    ("mu [cP]", "0.0227", 22.7e-6),
    ("η [µP]", "227", 22.7e-6),
    ("viscosity [kg/(m s)]", "2.27e-5", 22.7e-6),
    ("dynamic viscosity [mPa*s]", "0.0227", 22.7e-6),
])
def test_viscosity_header_units(tmp_path, header, cell, si):
    path = write(tmp_path, "v.csv", f"T [K],{header}\n300,{cell}\n")
    assert read_table(path).get("viscosity").value[0] == pytest.approx(si, rel=1e-12)


@pytest.mark.parametrize("header, cell, si", [
    ("k (mW/(m·K))", "17.8", 0.0178),
    ("thermal conductivity [W/(m*K)]", "0.0178", 0.0178),
    ("lambda [W m^-1 K^-1]", "0.0178", 0.0178),
    ("λ [W m⁻¹ K⁻¹]", "0.0178", 0.0178),
    ("k [Btu/(h ft °F)]", "0.01", 0.01 * 1.730735),
])
def test_conductivity_header_units(tmp_path, header, cell, si):
    path = write(tmp_path, "k.csv", f"T [K],{header}\n300,{cell}\n")
    assert read_table(path).get("conductivity").value[0] == pytest.approx(si, rel=5e-7)


@pytest.mark.parametrize("header, cell, kelvin", [
    ("T [K]", "300", 300.0),
    ("Temperature (°C)", "26.85", 300.0),    # NIST SP 811 4.2.1.1: T/K = t/°C + 273.15
    ("temp [degC]", "-73.15", 200.0),
    ("T [°F]", "80.33", 300.0),              # NIST SP 811 B.9: T/K = (t/°F + 459.67)/1.8
    ("T [degF]", "32", 273.15),
])
def test_temperature_header_units(tmp_path, header, cell, kelvin):
    path = write(tmp_path, "t.csv", f"{header},viscosity [uPa s]\n{cell},22.7\n")
    assert read_table(path).get("viscosity").temperature[0] == pytest.approx(kelvin, abs=1e-9)


def test_pressure_column_in_kpa(tmp_path):
    path = write(tmp_path, "p.csv", "T [K],p [kPa],viscosity [uPa s]\n300,101.325,22.7\n")
    assert read_table(path).get("viscosity").pressure[0] == pytest.approx(101325.0)


# Invented D values of argon's size near 1 atm (synthetic, cm²/s).
@pytest.mark.parametrize("header, pascal", [
    ("D at 1 atm [cm2/s]", 101325.0), ("self-diffusion at 101325 Pa [cm^2/s]", 101325.0),
    ("Self diffusion coefficient at 2 bar (cm²/s)", 2e5),
])
def test_pressure_stated_in_a_property_header(tmp_path, header, pascal):
    table = read_table(write(tmp_path, "d.csv", f"T [K],{header}\n300,0.188\n400,0.31\n"))
    assert table.get("self_diffusion").pressure.tolist() == pytest.approx([pascal, pascal])
    assert list(table.warnings) == []


def test_header_pressure_fills_rows_without_and_must_agree_with_the_pressure_column(tmp_path):
    table = read_table(write(tmp_path, "d.csv", "T [K],p [kPa],D at 1 atm [cm2/s]\n300,,0.188\n400,101.325,0.31\n"))
    assert table.get("self_diffusion").pressure.tolist() == pytest.approx([101325.0, 101325.0])
    with pytest.raises(InputProblems, match=r"row 3.*header states 101325 Pa .* pressure column gives another"):
        read_table(write(tmp_path, "e.csv", "T [K],p [kPa],D at 1 atm [cm2/s]\n300,,0.188\n400,200,0.31\n"))


def test_header_pressure_not_above_zero_and_other_at_phrases(tmp_path):
    with pytest.raises(InputProblems, match="the pressure '0 bar' in the header must be above zero"):
        read_table(write(tmp_path, "d.csv", "T [K],D at 0 bar [cm2/s]\n300,0.188\n"))
    # 'at' followed by something that is not a pressure: an ordinary unknown column
    table = read_table(write(tmp_path, "v.csv", "T [K],viscosity [uPa s],viscosity at 25 °C [uPa s]\n300,22.7,22.0\n"))
    assert [s.kind for s in table.series] == ["viscosity"]
    assert any("'viscosity at 25 °C [uPa s]' (C) is not a quantity fitkin reads" in w for w in table.warnings)


def test_prediction_table_columns_that_are_not_measurements_are_one_warning(tmp_path):
    text = ("T [K],viscosity [uPa s],viscosity lower 0.95 [uPa s],viscosity upper 0.95 [uPa s],"
            "D at 101325 Pa [cm^2/s],D at 101325 Pa lower 0.95 [cm^2/s],D at 101325 Pa upper 0.95 [cm^2/s],"
            "extrapolated\n300,22.7,22.6,22.8,0.188,0.187,0.189,no\n")
    table = read_table(write(tmp_path, "t.csv", text))
    assert sorted(s.kind for s in table.series) == ["self_diffusion", "viscosity"]
    assert list(table.warnings) == [f"{tmp_path / 't.csv'}: the band limits (columns C, D, F, G) and the 'extrapolated' "
                              "flag (column H) of a fitkin prediction table are not measured data; left out"]
    mixture = ("T [K],viscosity [uPa s],viscosity lower 0.9 [uPa s],binary diffusion with He at 101325 Pa [cm^2/s],"
               "mixture viscosity x(Ar) = 0.5 [uPa s],extrapolated\n300,22.7,22.6,0.7,21.0,no\n")
    table = read_table(write(tmp_path, "m.csv", mixture))
    assert [s.kind for s in table.series] == ["viscosity"]
    assert list(table.warnings) == [f"{tmp_path / 'm.csv'}: the band limits (column C), the mixture predictions "
                                    "(columns D, E) and the 'extrapolated' flag (column F) of a fitkin prediction "
                                    "table are not measured data; left out"]
    table = read_table(write(tmp_path, "f.csv", "T [K],viscosity [uPa s],extrapolated\n300,22.7,no\n"))
    assert list(table.warnings) == [f"{tmp_path / 'f.csv'}: the 'extrapolated' flag (column C) of a fitkin prediction "
                              "table is not measured data; left out"]


def test_units_override_applies_to_columns_without_a_unit(tmp_path):
    path = write(tmp_path, "o.csv", "T,viscosity,u(viscosity)\n300,22.7,0.05\n")
    table = read_table(path, units={"temperature": "°C", "eta": "µPa s", "u(mu)": "uPa s"})
    s = table.get("viscosity")
    assert s.temperature[0] == pytest.approx(573.15)
    assert s.value[0] == pytest.approx(22.7e-6) and s.uncertainty[0] == pytest.approx(5e-8)
    assert s.unit == "µPa s"


def test_units_override_equal_to_the_header_is_accepted(tmp_path):
    path = write(tmp_path, "o.csv", "T [K],viscosity [uPa s]\n300,22.7\n")
    assert read_table(path, units={"viscosity": "µPa·s"}).get("viscosity").value[0] == pytest.approx(22.7e-6)


def test_units_override_conflicting_with_the_header_is_an_error(tmp_path):
    path = write(tmp_path, "o.csv", "T [K],viscosity [uPa s]\n300,22.7\n")
    with pytest.raises(InputProblems) as info:
        read_table(path, units={"viscosity": "mPa s"})
    (p,) = info.value.problems
    assert p.file == str(path) and p.row == 1 and p.column == "viscosity [uPa s]"
    assert "units=" in str(p) and "mPa s" in str(p)


def test_units_override_with_an_unknown_name_is_an_error(tmp_path):
    path = write(tmp_path, "o.csv", "T [K],viscosity [uPa s]\n300,22.7\n")
    with pytest.raises(InputError) as info:
        read_table(path, units={"density": "kg/m^3"})
    assert "density" in str(info.value)


def test_relative_and_absolute_uncertainties_become_absolute_si(tmp_path):
    text = ("T [K],viscosity [uPa s],u(viscosity) [uPa s],k [mW/(m K)],u(k) [%]\n"
            "300,22.7,0.05,17.8,2\n"
            "400,27.4,0.06,22.0,1.5\n")
    table = read_table(write(tmp_path, "u.csv", text))
    mu, k = table.get("viscosity"), table.get("conductivity")
    np.testing.assert_allclose(mu.uncertainty, [5e-8, 6e-8], rtol=1e-12)
    np.testing.assert_allclose(k.uncertainty, [0.02 * 0.0178, 0.015 * 0.022], rtol=1e-12)
    assert mu.uncertainty_kind == "absolute" and k.uncertainty_kind == "relative"
    assert mu.has_uncertainty and k.has_uncertainty


def test_uncertainty_named_by_any_synonym(tmp_path):
    text = "T [K],eta [cP],u(viscosity) (cP)\n300,0.0227,0.0001\n"
    s = read_table(write(tmp_path, "u.csv", text)).get("viscosity")
    assert s.uncertainty[0] == pytest.approx(1e-7)


def test_temperature_uncertainty_in_celsius_is_a_difference_and_is_reported_unused(tmp_path):
    text = "T [°C],viscosity [uPa s],u(T) [°C]\n26.85,22.7,0.1\n"
    table = read_table(write(tmp_path, "ut.csv", text))
    assert any("u(T) [°C]" in w and "not used" in w for w in table.warnings)
    text = "T [°C],viscosity [uPa s],u(T) [°C]\n26.85,22.7,-0.1\n"
    with pytest.raises(InputProblems):
        read_table(write(tmp_path, "ut2.csv", text))


def test_sources_label_points_and_default_to_the_file_stem(tmp_path):
    text = ("T [K],viscosity [uPa s],Dataset\n"
            "300,22.7,capillary 2019\n"
            "400,27.4,oscillating disk\n"
            "500,31.9,\n")
    table = read_table(write(tmp_path, "ar_visc.csv", text))
    assert list(table.get("viscosity").source) == ["capillary 2019", "oscillating disk", "ar_visc"]
    assert any("row 4" in w and "ar_visc" in w for w in table.warnings)


def test_mixed_table_with_both_properties_and_blank_cells(tmp_path):
    text = ("# synthetic data\n"
            "T [K],viscosity [µPa s],u(viscosity) [%],k [mW/(m K)],u(k) [mW/(m K)],source\n"
            "300,22.7,0.3,17.8,0.2,A\n"
            "350,,,20.0,0.2,B\n"
            "400,27.4,0.3,,,A\n"
            "450,29.6,0.3,24.1,0.3,\n")
    table = read_table(write(tmp_path, "mixed.csv", text))
    mu, k = table.get("viscosity"), table.get("conductivity")
    assert [s.kind for s in table.series] == ["viscosity", "conductivity"]
    assert list(mu.rows) == [3, 5, 6] and list(k.rows) == [3, 4, 6]
    np.testing.assert_allclose(mu.temperature, [300, 400, 450])
    np.testing.assert_allclose(k.temperature, [300, 350, 450])
    np.testing.assert_allclose(mu.uncertainty, 0.003 * mu.value, rtol=1e-12)
    np.testing.assert_allclose(k.uncertainty, [2e-4, 2e-4, 3e-4], rtol=1e-12)
    assert list(k.source) == ["A", "B", "mixed"]


def test_unknown_columns_are_ignored_with_a_warning(tmp_path):
    text = "T [K],viscosity [uPa s],operator\n300,22.7,jd\n"
    table = read_table(write(tmp_path, "x.csv", text))
    assert any("'operator'" in w and "ignored" in w for w in table.warnings)


def test_temperature_without_property_value_is_warned(tmp_path):
    text = "T [K],viscosity [uPa s]\n300,22.7\n400,\n"
    table = read_table(write(tmp_path, "x.csv", text))
    assert len(table.get("viscosity")) == 1
    assert any("row 3" in w and "no property value" in w for w in table.warnings)


def test_only_kinds_fitkin_fits_become_series(tmp_path, monkeypatch):
    # a registered property kind not (yet) in PROPERTY_KINDS: its cells are parsed, then ignored
    from dataclasses import replace
    import fitkin.io.tables as tables
    monkeypatch.setattr(tables, "PURE_LAYOUT", replace(tables.PURE_LAYOUT, kinds=("viscosity",)))
    path = write(tmp_path, "m.csv", "T [K],viscosity [uPa s],k [mW/(m K)]\n300,22.7,17.8\n")
    table = tables.read_table(path)
    assert [s.kind for s in table.series] == ["viscosity"]
    assert any("k [mW/(m K)]" in w and "does not fit" in w for w in table.warnings)
