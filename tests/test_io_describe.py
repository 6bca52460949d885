"""describe_table: the summary lines shown before fitting."""
from fitkin.io import describe_table, read_table


def test_describe_names_points_range_units_uncertainties_sources_and_warnings(tmp_path):
    path = tmp_path / "argon_2026.csv"
    path.write_text(
        "# synthetic data\n"
        "T [°C],viscosity [µPa s],u(viscosity) [µPa s],k [mW/(m K)],u(k) [%],p [MPa],source\n"
        "26.85,22.7,0.05,17.8,1,0.1,capillary\n"
        "126.85,27.4,0.06,,,0.1,capillary\n"
        "226.85,31.9,0.07,26.5,1,3,disk\n", encoding="utf-8")
    lines = describe_table(read_table(path))
    text = "\n".join(lines)
    assert lines[0].startswith("argon_2026.csv")
    assert ("viscosity: 3 points, 300.00 K to 500.00 K, unit 'µPa s' in the header, "
            "pressure 100 kPa to 3000 kPa") in text
    assert "thermal conductivity: 2 points, 300.00 K to 500.00 K, unit 'mW/(m K)'" in text
    assert "absolute, in 'µPa s'" in text
    assert "relative, in % of the value" in text
    assert "capillary (2), disk (1)" in text and "capillary (1), disk (1)" in text
    assert any(line.startswith("  warning:") and "row 5" in line for line in lines)


def test_describe_without_uncertainty_or_source(tmp_path):
    path = tmp_path / "plain.tsv"
    path.write_text("T [K]\teta [cP]\n300\t0.0227\n", encoding="utf-8")
    text = "\n".join(describe_table(read_table(path)))
    assert "viscosity: 1 point," in text
    assert "none stated" in text and "plain (1)" in text
    assert "warning" not in text


def test_describe_says_when_the_unit_was_given_separately(tmp_path):
    path = tmp_path / "bare.csv"
    path.write_text("T,viscosity\n300,22.7\n", encoding="utf-8")
    text = "\n".join(describe_table(read_table(path, units={"T": "K", "viscosity": "µPa s"})))
    assert "unit 'µPa s' (given separately, not in the header)" in text
