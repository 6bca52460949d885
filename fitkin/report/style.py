"""Look of the report: colours, markers, figure sizes, display units and the page's CSS.

One calm palette used by the figures and the page alike. Source colours are told apart by
marker shape as well, so the figures stay readable in grey print.
"""
from __future__ import annotations

__all__ = ["INK", "MUTED", "FIT", "BAND", "EXTRAPOLATION", "SOURCE_COLOURS", "SOURCE_MARKERS",
           "DISPLAY", "ALWAYS_SHOWN", "shown_kinds", "FIGURE_WIDTH", "source_style", "style_axes", "PAGE_CSS"]

INK = "#1d2733"          # text, axes
MUTED = "#6b7785"        # secondary text, reference lines
FIT = "#1f4e79"          # the fitted curve
BAND = "#9dbad6"         # the uncertainty band of the fit
EXTRAPOLATION = "#f1ede4"  # background outside the measured range
SOURCE_COLOURS = ("#b5651d", "#2e7d6b", "#7b3f8c", "#8a7a12", "#b03a48", "#3f6fb5", "#5c5c5c")
SOURCE_MARKERS = ("o", "s", "^", "D", "v", "P", "X")
FIGURE_WIDTH = 7.2  # inches: fits an A4/Letter text column when printed

#: Display units per property: (symbol, unit label, factor from SI).
DISPLAY = {
    "viscosity": ("μ", "µPa·s", 1e6),
    "conductivity": ("k", "mW/(m·K)", 1e3),
    "second_virial": ("B", "cm³/mol", 1e6),
}
#: Properties drawn in every report (as predictions where not measured); the others of
#: :data:`DISPLAY` only when measured.
ALWAYS_SHOWN = ("viscosity", "conductivity")


def shown_kinds(record: dict) -> list[str]:
    """The properties the report draws for ``record``, in :data:`DISPLAY` order."""
    measured = {r.get("property") for r in record.get("residuals") or []}
    return [k for k in DISPLAY if k in ALWAYS_SHOWN or k in measured]


def source_style(index: int) -> dict:
    """Colour and marker of the ``index``-th data source."""
    return {"color": SOURCE_COLOURS[index % len(SOURCE_COLOURS)],
            "marker": SOURCE_MARKERS[index % len(SOURCE_MARKERS)]}


def style_axes(ax) -> None:
    """Quiet axes: no top/right spines, light grid, ink-coloured labels."""
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    for side in ("left", "bottom"):
        ax.spines[side].set_color(MUTED)
    ax.tick_params(colors=INK, labelsize=8.5, direction="out", length=3)
    ax.grid(True, color="#e3e7ec", linewidth=0.6)
    ax.set_axisbelow(True)
    ax.xaxis.label.set_color(INK)
    ax.yaxis.label.set_color(INK)
    ax.xaxis.label.set_size(9.5)
    ax.yaxis.label.set_size(9.5)


PAGE_CSS = """
:root { --ink: #1d2733; --muted: #5f6b79; --rule: #d9dee4; --paper: #ffffff; --tint: #f4f6f8;
        --accent: #1f4e79; --warn: #8a4b08; --warnbg: #fdf5e8; --ok: #2e6b4f; }
* { box-sizing: border-box; }
body { margin: 0; background: #eef1f4; color: var(--ink);
       font: 15px/1.5 "Source Sans 3", "Segoe UI", "Helvetica Neue", Arial, sans-serif; }
main { max-width: 1040px; margin: 0 auto; background: var(--paper); padding: 28px 44px 40px; }
header.top { border-bottom: 3px solid var(--accent); padding-bottom: 10px; margin-bottom: 18px; }
header.top h1 { font-size: 25px; margin: 0 0 4px; font-weight: 600; letter-spacing: .2px; }
header.top p { margin: 0; color: var(--muted); font-size: 13.5px; }
h2 { font-size: 19px; font-weight: 600; margin: 34px 0 10px; padding-bottom: 4px;
     border-bottom: 1px solid var(--rule); }
h3 { font-size: 15.5px; font-weight: 600; margin: 20px 0 6px; }
p.lead { color: var(--muted); margin-top: 0; }
nav.toc { font-size: 13px; margin: 0 0 18px; color: var(--muted); }
nav.toc a { color: var(--accent); text-decoration: none; margin-right: 14px; white-space: nowrap; }
section.summary { background: var(--tint); border: 1px solid var(--rule); border-radius: 6px;
                  padding: 16px 20px 12px; }
section.summary h2 { margin-top: 0; border: none; }
.cards { display: grid; grid-template-columns: repeat(auto-fit, minmax(190px, 1fr)); gap: 12px; }
.card { background: var(--paper); border: 1px solid var(--rule); border-radius: 5px; padding: 9px 12px; }
.card .label { font-size: 12.5px; color: var(--muted); letter-spacing: .2px; }
.card .value { font-size: 19px; font-weight: 600; font-variant-numeric: tabular-nums; }
.card .sub { font-size: 12.5px; color: var(--muted); }
.verdict { margin: 12px 0 4px; font-size: 14.5px; }
.verdict b.ok { color: var(--ok); } .verdict b.warn { color: var(--warn); }
table { border-collapse: collapse; margin: 8px 0 14px; font-size: 13.5px; font-variant-numeric: tabular-nums; }
th, td { padding: 4px 10px; border-bottom: 1px solid var(--rule); text-align: right; vertical-align: top; }
th { font-weight: 600; background: var(--tint); }
td.text, th.text { text-align: left; }
table.wide { width: 100%; }
figure { margin: 14px 0 20px; page-break-inside: avoid; break-inside: avoid; }
figure img { width: 100%; height: auto; display: block; border: 1px solid var(--rule); }
figcaption { font-size: 13px; color: var(--muted); margin-top: 5px; }
ul.warnings { list-style: none; padding: 0; margin: 6px 0; }
ul.warnings li { background: var(--warnbg); border-left: 4px solid var(--warn); padding: 6px 10px; margin: 5px 0;
                 font-size: 14px; }
ul.notes li { margin: 3px 0; font-size: 14px; }
.caution { border: 2px solid var(--warn); background: var(--warnbg); border-radius: 6px;
           padding: 12px 16px; margin-top: 30px; }
.caution h2 { margin-top: 0; border: none; color: var(--warn); }
.small { font-size: 12.5px; color: var(--muted); }
code, .mono { font-family: "Source Code Pro", Consolas, "DejaVu Sans Mono", monospace; font-size: 12.5px;
              word-break: break-all; }
footer { margin-top: 26px; font-size: 12px; color: var(--muted); border-top: 1px solid var(--rule);
         padding-top: 8px; }
@media print {
  body { background: #fff; font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  nav.toc { display: none; }
  h2, h3 { page-break-after: avoid; break-after: avoid; break-inside: avoid; }
  /* keep a heading with what follows: reserve room below it without taking space */
  h2::after { content: ""; display: block; height: 24em; margin-bottom: -24em; }
  h3::after { content: ""; display: block; height: 10em; margin-bottom: -10em; }
  p.lead { break-after: avoid; }
  section.summary, .caution, ul.warnings li, th { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  table, figure { page-break-inside: avoid; break-inside: avoid; }
  a { color: inherit; text-decoration: none; }
  @page { margin: 16mm 14mm; }
}
"""
