"""Reports: HTML pages (:mod:`.pages`), one exchanger's study as displayed (:mod:`.case`, its plant-data section in
:mod:`.plant`), the other kinds' reports (:mod:`.air`, :mod:`.condenser`), the unit's pages (:mod:`.train`,
:mod:`.cleaning`), exports (:mod:`.export`) and the notebooks' interactive controls (:mod:`.widgets`). No physics here.
"""
from .case import (
                   RATING_COLUMNS,
                   breakdown_figure,
                   case_header_html,
                   cycle_text,
                   monitoring_items,
                   notes_legend,
                   option_breakdown_figure,
                   rating_items,
                   ratings_table,
                   recommendation_html,
                   rf_figure,
                   run_case,
                   study_items,
                   study_money_table,
                   study_table,
                   summary,
                   train_value_items,
                   unit_figure,
                   unit_table,
                   write_summary,
)
from . import condenser  # noqa: F401  (the condenser study's report: ``report.condenser``)
from .export import rating_frame, report_tables, write_csv, write_workbook
from .pages import (
                   CAUTIONS,
                   PACKAGES,
                   cautions_html,
                   copy_plotly_js,
                   defaults_html,
                   esc,
                   figure_html,
                   frame_html,
                   file_sha256,
                   page,
                   plot_text,
                   plotly_js_source,
                   polish_figure,
                   provenance,
                   provenance_html,
                   safe_name,
                   show,
                   table_html,
                   write_atomic,
)
from .widgets import (
                   primer_sweep,
                   primer_table,
                   primer_widget,
                   what_if,
                   what_if_widget,
                   widgets_available,
)

__all__ = [
    "CAUTIONS", "PACKAGES", "RATING_COLUMNS", "breakdown_figure", "case_header_html", "cautions_html", "cycle_text",
    "copy_plotly_js", "defaults_html", "esc", "figure_html", "frame_html", "polish_figure", "file_sha256",
    "monitoring_items", "notes_legend", "option_breakdown_figure", "page",
    "plot_text", "plotly_js_source", "primer_sweep", "primer_table", "primer_widget", "provenance",
    "provenance_html", "rating_items", "ratings_table", "recommendation_html", "rf_figure", "run_case", "safe_name", "show",
    "study_items", "study_money_table", "study_table", "summary", "table_html", "train_value_items", "unit_figure",
    "unit_table",
    "what_if", "what_if_widget", "widgets_available", "write_atomic", "write_summary",
    "rating_frame", "report_tables", "write_csv", "write_workbook",
]
